import { readdirSync, readFileSync } from 'node:fs';
import { basename, isAbsolute, join, relative, resolve } from 'node:path';
import { LineCounter, parseDocument } from 'yaml';
import type { PlanProduct, PlanStep } from './plan-definition';
import { REPO_ROOT } from './plan-artifacts';
import { stepsChecksum } from './plan-checksum';
import { locate, pathString, type RawIssue } from './plan-positions';
import { runSchema, schemaValidator } from './plan-schema-check';
import { checkSteps, type RawStep } from './plan-steps-check';

export { canonicalJson, stepsChecksum } from './plan-checksum';

/**
 * Loads and checks test-plan files (test-plans/*.plan.yaml, format in docs/test-plan-format.md).
 *
 * Three passes, each reporting every problem it finds with the field path and the line and column in the file:
 * 1. YAML syntax (the `yaml` package, positions through its LineCounter);
 * 2. the JSON Schema built from the step-kind registry (plan-schema.ts; written out as test-plans/plan.schema.json),
 *    checked by ajv: fields, types, ranges, parameters each kind needs (plan-schema-check.ts);
 * 3. checks across fields (plan-steps-check.ts): unique keys, limit keys the kind produces, low < high, acceptance
 *    zones that leave a physically possible value, loads within the product's rating, inputs within its range.
 * A plan that passes comes back normalised: `nominal ± tolerance` turned into low/high, default names and units
 * filled in, uncertainty and rule always present.
 */

/** Where plan files live by default. */
export const DEFAULT_PLANS_DIR = join(REPO_ROOT, 'test-plans');
/** File names the directory loader picks up. */
const PLAN_FILE_SUFFIX = '.plan.yaml';
/**
 * Limit on YAML alias expansion (the `yaml` package weighs each alias by the size of the node it repeats), so a
 * small file that expands into millions of nodes (an alias bomb) is refused as a plan problem, not a crash.
 */
const MAX_ALIAS_COUNT = 100;

/** One problem in a plan, where it is and what to do about it. Line and column are 1-based; 0 when unknown. */
export interface PlanIssue {
  file?: string;
  /** Field path, e.g. `steps[3].limits[0].high`; `(file)` for the document as a whole */
  path: string;
  line: number;
  column: number;
  message: string;
}

/** Thrown by the loaders; `issues` lists every problem found, not just the first. */
export class PlanFileError extends Error {
  constructor(
    readonly file: string,
    readonly issues: PlanIssue[],
  ) {
    super(
      `${issues.length} problem(s) in test plan ${file}:\n` +
        issues.map((i) => `  ${formatIssue(i)}`).join('\n'),
    );
    this.name = 'PlanFileError';
  }
}

/** "test-plans/OB-BK0503.plan.yaml line 42, steps[3].limits[0].high: must be a number" */
export function formatIssue(i: PlanIssue): string {
  const where = i.line > 0 ? `${i.file ?? '(text)'} line ${i.line}, column ${i.column}` : (i.file ?? '(text)');
  return `${where}, ${i.path}: ${i.message}`;
}

export type { PlanProduct };

export interface PlanHeader {
  planCode: string;
  planName: string;
  partNumber: string;
  revision: number;
  reason: string;
  author: string;
  stopAtFirstFailure: boolean;
  maxAttempts: number;
}

/** A plan file that passed every check, normalised. */
export interface PlanFile {
  /** Path as shown in messages (relative to the repository root when inside it) */
  file: string;
  header: PlanHeader;
  steps: PlanStep[];
  /** SHA-256 (hex) of the canonical JSON of `steps`, see {@link stepsChecksum} */
  checksum: string;
}

export interface PlanCheckOptions {
  /** The product the plan is for; the header's part number must match it */
  product?: PlanProduct;
  /** Known products; the header's part number is looked up here */
  products?: PlanProduct[];
}

function findProduct(partNumber: string, opts: PlanCheckOptions): { product?: PlanProduct; problem?: string } {
  if (opts.product) {
    if (opts.product.partNumber !== partNumber) {
      return { problem: `this plan is for ${partNumber}, but it is being checked for ${opts.product.partNumber}` };
    }
    return { product: opts.product };
  }
  if (opts.products) {
    const product = opts.products.find((p) => p.partNumber === partNumber);
    if (!product) {
      const known = opts.products.map((p) => p.partNumber).join(', ') || 'none';
      return { problem: `unknown part number "${partNumber}" (known: ${known})` };
    }
    return { product };
  }
  return {};
}

/**
 * Parses and checks the text of a plan file.
 * @param text YAML text
 * @param file name shown in messages
 * @returns the normalised plan when there are no issues, and every issue found
 */
export function parsePlanText(text: string, file: string, opts: PlanCheckOptions = {}): { plan?: PlanFile; issues: PlanIssue[] } {
  const lc = new LineCounter();
  const doc = parseDocument(text, { lineCounter: lc, prettyErrors: false, uniqueKeys: true });
  if (doc.errors.length > 0) {
    return {
      issues: doc.errors.map((e) => {
        const pos = lc.linePos(e.pos[0]);
        return { file, path: '(syntax)', line: pos.line, column: pos.col, message: `YAML syntax: ${e.message.split('\n')[0]}` };
      }),
    };
  }
  let data: unknown;
  try {
    data = doc.toJS({ maxAliasCount: MAX_ALIAS_COUNT });
  } catch (err) {
    // the yaml package throws a ReferenceError when aliases would expand past the limit (an "alias bomb")
    // and when an alias names no anchor set before it
    if (!(err instanceof ReferenceError)) throw err;
    const unresolved = /unresolved alias/i.test(err.message);
    return {
      issues: [
        {
          file,
          path: '(syntax)',
          line: 0,
          column: 0,
          message: unresolved
            ? `YAML alias without an anchor (${err.message}); set &name before using *name, or write the value out`
            : `YAML aliases expand too far (${err.message}); a plan file needs few or no aliases (*name), write the values out`,
        },
      ],
    };
  }
  const toIssues = (raw: RawIssue[]): PlanIssue[] =>
    raw.map((r) => ({ file, path: pathString(r.segs), ...locate(doc, lc, r.segs, r.atKey ?? false), message: r.message }));

  if (data === null || typeof data !== 'object' || Array.isArray(data)) {
    return { issues: toIssues([{ segs: [], message: 'the file must be a mapping with format, header and steps' }]) };
  }
  const schemaIssues = runSchema(schemaValidator(), data, []);
  if (schemaIssues.length > 0) return { issues: toIssues(schemaIssues) };

  const raw = data as { header: PlanHeader; steps: RawStep[] };
  const issues: RawIssue[] = [];
  const { product, problem } = findProduct(raw.header.partNumber, opts);
  if (problem) issues.push({ segs: ['header', 'partNumber'], message: problem });
  const checked = checkSteps(raw.steps, product, ['steps']);
  issues.push(...checked.issues);
  if (issues.length > 0) return { issues: toIssues(issues) };

  const header: PlanHeader = { ...raw.header };
  return { plan: { file, header, steps: checked.steps, checksum: stepsChecksum(checked.steps) }, issues: [] };
}

/**
 * Checks steps that arrive as JSON (the plans API), with the same rules as a plan file.
 * @param steps the request's steps, untrusted
 * @param product the plan's product, for the rating checks
 * @returns normalised steps when there are no issues, and every issue with its field path (`steps[2].limits[0].high`)
 */
export function validatePlanSteps(steps: unknown, product?: PlanProduct): { steps?: PlanStep[]; issues: { path: string; message: string }[] } {
  const schemaIssues = runSchema(schemaValidator('steps'), steps, ['steps']);
  const toIssues = (raw: RawIssue[]) => raw.map((r) => ({ path: pathString(r.segs), message: r.message }));
  if (schemaIssues.length > 0) return { issues: toIssues(schemaIssues) };
  const checked = checkSteps(steps as RawStep[], product, ['steps']);
  if (checked.issues.length > 0) return { issues: toIssues(checked.issues) };
  return { steps: checked.steps, issues: [] };
}

/** Path shown in messages: relative to the repository root when the file is inside it. */
function displayName(path: string): string {
  const abs = resolve(path);
  const rel = relative(REPO_ROOT, abs);
  return rel && !rel.startsWith('..') && !isAbsolute(rel) ? rel : abs;
}

/**
 * Reads and checks one plan file.
 * @param path file path
 * @returns the normalised plan
 * @throws PlanFileError listing every problem (an unreadable file is one problem at line 0)
 */
export function loadPlanFile(path: string, opts: PlanCheckOptions = {}): PlanFile {
  const file = displayName(path);
  let text: string;
  try {
    text = readFileSync(path, 'utf8');
  } catch (err) {
    throw new PlanFileError(file, [{ file, path: '(file)', line: 0, column: 0, message: `cannot read the file: ${(err as Error).message}` }]);
  }
  const { plan, issues } = parsePlanText(text, file, opts);
  if (!plan) throw new PlanFileError(file, issues);
  return plan;
}

/**
 * Reads and checks every `*.plan.yaml` in a folder, in name order. Plan codes and part numbers must be unique
 * across the folder (one plan per product).
 * @throws PlanFileError listing the problems of every file at once
 */
export function loadAllPlanFiles(dir: string = DEFAULT_PLANS_DIR, opts: PlanCheckOptions = {}): PlanFile[] {
  let names: string[];
  try {
    names = readdirSync(dir).filter((n) => n.endsWith(PLAN_FILE_SUFFIX)).sort();
  } catch (err) {
    const shown = displayName(dir);
    throw new PlanFileError(shown, [{ file: shown, path: '(file)', line: 0, column: 0, message: `cannot read the plan folder: ${(err as Error).message}` }]);
  }
  const plans: PlanFile[] = [];
  const issues: PlanIssue[] = [];
  for (const name of names) {
    try {
      plans.push(loadPlanFile(join(dir, name), opts));
    } catch (err) {
      if (!(err instanceof PlanFileError)) throw err;
      issues.push(...err.issues);
    }
  }
  const byCode = new Map<string, string>();
  const byPart = new Map<string, string>();
  for (const plan of plans) {
    const sameCode = byCode.get(plan.header.planCode);
    const samePart = byPart.get(plan.header.partNumber);
    if (sameCode) issues.push({ file: plan.file, path: 'header.planCode', line: 0, column: 0, message: `plan code ${plan.header.planCode} is also used by ${sameCode}` });
    if (samePart) issues.push({ file: plan.file, path: 'header.partNumber', line: 0, column: 0, message: `${plan.header.partNumber} already has a plan in ${samePart}; keep one plan file per product` });
    byCode.set(plan.header.planCode, plan.file);
    byPart.set(plan.header.partNumber, plan.file);
  }
  if (issues.length > 0) throw new PlanFileError(displayName(dir), issues);
  return plans;
}

/** File name without folders, for the `sourceFile` column. */
export function planSourceName(plan: PlanFile): string {
  return basename(plan.file);
}
