import Ajv, { type ErrorObject, type ValidateFunction } from 'ajv';
import addFormats from 'ajv-formats';
import { createHash } from 'node:crypto';
import { readdirSync, readFileSync } from 'node:fs';
import { basename, isAbsolute, join, relative, resolve } from 'node:path';
import { isMap, isScalar, isSeq, LineCounter, parseDocument, type Document } from 'yaml';
import { guardedLimits } from '../measure/acceptance';
import type { DecisionRule, LimitSpec, PlanProduct, PlanStep, StepKind, StepParams } from './plan-definition';
import { KIND_PARAMS, KIND_QUANTITY_INFO, sameLoad, splitLimitKey, type QuantityInfo } from './plan-quantities';

/**
 * Loads and checks test-plan files (test-plans/*.plan.yaml, format in docs/test-plan-format.md).
 *
 * Three passes, each reporting every problem it finds with the field path and the line and column in the file:
 * 1. YAML syntax (the `yaml` package, positions through its LineCounter);
 * 2. the JSON Schema test-plans/plan.schema.json (ajv): fields, types, ranges, parameters each kind needs;
 * 3. checks across fields: unique keys, limit keys the kind produces, low < high, guard bands that leave an
 *    acceptance zone, loads within the product's rating and input voltages within its range.
 * A plan that passes comes back normalised: `nominal ± tolerance` turned into low/high, default names and units
 * filled in, uncertainty and rule always present.
 */

/** Path of the repository root, from src/plans or dist/plans alike. */
const REPO_ROOT = resolve(__dirname, '..', '..', '..');
/** Where plan files live by default. */
export const DEFAULT_PLANS_DIR = join(REPO_ROOT, 'test-plans');
const SCHEMA_PATH = join(DEFAULT_PLANS_DIR, 'plan.schema.json');
const SCHEMA_ID = 'urn:railwright:test-plan:1';
/** File names the directory loader picks up. */
const PLAN_FILE_SUFFIX = '.plan.yaml';

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

// ---------------------------------------------------------------------------------------------------------
// canonical form and checksum

/** JSON with object keys sorted at every level and undefined members left out, so equal plans hash equally. */
export function canonicalJson(value: unknown): string {
  const sortKeys = (v: unknown): unknown => {
    if (Array.isArray(v)) return v.map(sortKeys);
    if (v !== null && typeof v === 'object') {
      const out: Record<string, unknown> = {};
      for (const k of Object.keys(v as object).sort()) {
        const member = (v as Record<string, unknown>)[k];
        if (member !== undefined) out[k] = sortKeys(member);
      }
      return out;
    }
    return v;
  };
  return JSON.stringify(sortKeys(value));
}

/** SHA-256, hex, of the canonical JSON of a plan's steps; printed on reports and used to spot unchanged files. */
export function stepsChecksum(steps: PlanStep[]): string {
  return createHash('sha256').update(canonicalJson(steps)).digest('hex');
}

// ---------------------------------------------------------------------------------------------------------
// schema pass

type Seg = string | number;
interface RawIssue {
  segs: Seg[];
  message: string;
  /** Point at the field name rather than its value (unknown or duplicate fields) */
  atKey?: boolean;
}

let ajvInstance: Ajv | undefined;
function schemaValidator(fragment?: 'steps'): ValidateFunction {
  if (!ajvInstance) {
    // strictRequired off: the per-kind "then" branches name parameters that are defined once, under definitions/params
    ajvInstance = new Ajv({ allErrors: true, strict: true, strictRequired: false, allowUnionTypes: true });
    addFormats(ajvInstance);
    ajvInstance.addSchema(JSON.parse(readFileSync(SCHEMA_PATH, 'utf8')) as object);
  }
  const ref = fragment ? `${SCHEMA_ID}#/definitions/${fragment}` : SCHEMA_ID;
  const fn = ajvInstance.getSchema(ref);
  if (!fn) throw new Error(`plan schema ${ref} not found in ${SCHEMA_PATH}`);
  return fn;
}

function pointerToSegs(pointer: string): Seg[] {
  if (!pointer) return [];
  return pointer
    .slice(1)
    .split('/')
    .map((s) => s.replace(/~1/g, '/').replace(/~0/g, '~'))
    .map((s) => (/^\d+$/.test(s) ? Number(s) : s));
}

function valueAt(data: unknown, segs: Seg[]): unknown {
  let v = data;
  for (const s of segs) {
    if (v === null || typeof v !== 'object') return undefined;
    v = (v as Record<string | number, unknown>)[s];
  }
  return v;
}

const TYPE_WORDS: Record<string, string> = {
  number: 'a number',
  integer: 'a whole number',
  string: 'text',
  boolean: 'true or false',
  array: 'a list',
  object: 'a mapping of named fields',
  null: 'empty',
};

const PATTERN_HINTS: Record<string, string> = {
  planCode: 'must be 2–40 upper-case letters, digits or hyphens, e.g. EOL-BK0503',
  key: 'must be lower-case letters, digits and hyphens, starting with a letter (a step key) or a quantity such as voutV or efficiencyPct@1.5 (a limit key)',
};

function schemaIssue(e: ErrorObject, prefix: Seg[], data: unknown): RawIssue | null {
  const segs = [...prefix, ...pointerToSegs(e.instancePath)];
  const last = segs[segs.length - 1];
  const p = e.params as Record<string, unknown>;
  switch (e.keyword) {
    case 'if':
      // the failing "then" branch reports its own, more specific error
      return null;
    case 'required': {
      const missing = String(p.missingProperty);
      const fromKind = e.schemaPath.includes('/then/');
      const kind = fromKind ? valueAt(data, [...segs.slice(prefix.length, -1), 'kind']) : undefined;
      return {
        segs: [...segs, missing],
        message: fromKind && typeof kind === 'string' ? `is required for a step of kind ${kind}` : 'is required',
      };
    }
    case 'additionalProperties':
      return { segs: [...segs, String(p.additionalProperty)], message: 'is not a known field here (check the spelling)', atKey: true };
    case 'type':
      return { segs, message: `must be ${TYPE_WORDS[String(p.type)] ?? String(p.type)}` };
    case 'enum':
      return { segs, message: `must be one of: ${(p.allowedValues as unknown[]).map(String).join(', ')}` };
    case 'const':
      return { segs, message: `must be "${String(p.allowedValue)}"` };
    case 'pattern':
      return { segs, message: PATTERN_HINTS[String(last)] ?? `must match ${String(p.pattern)}` };
    case 'minimum':
      return { segs, message: `must be at least ${String(p.limit)}` };
    case 'maximum':
      return { segs, message: `must be at most ${String(p.limit)}` };
    case 'exclusiveMinimum':
      return { segs, message: `must be greater than ${String(p.limit)}` };
    case 'exclusiveMaximum':
      return { segs, message: `must be less than ${String(p.limit)}` };
    case 'minItems':
      return { segs, message: `must list at least ${String(p.limit)} item(s)` };
    case 'maxItems':
      return { segs, message: `must list at most ${String(p.limit)} items` };
    case 'minLength':
      return { segs, message: `must be at least ${String(p.limit)} character(s) long` };
    case 'maxLength':
      return { segs, message: `must be at most ${String(p.limit)} characters long` };
    case 'dependencies':
      return {
        segs: [...segs, String(p.property)],
        message: `needs ${String(p.missingProperty)} as well (write nominal with tolerance or tolerancePct)`,
      };
    default:
      return { segs, message: e.message ?? `fails the ${e.keyword} rule of the plan schema` };
  }
}

function runSchema(validate: ValidateFunction, data: unknown, prefix: Seg[]): RawIssue[] {
  if (validate(data)) return [];
  const seen = new Set<string>();
  const out: RawIssue[] = [];
  for (const e of validate.errors ?? []) {
    const issue = schemaIssue(e, prefix, data);
    if (!issue) continue;
    const id = `${pathString(issue.segs)}|${issue.message}`;
    if (seen.has(id)) continue;
    seen.add(id);
    out.push(issue);
  }
  return out;
}

// ---------------------------------------------------------------------------------------------------------
// cross-field pass (runs on data the schema accepted, so types can be trusted)

interface RawLimit {
  key: string;
  name?: string;
  unit?: string;
  low?: number;
  high?: number;
  nominal?: number;
  tolerance?: number;
  tolerancePct?: number;
  uncertainty?: number;
  rule?: DecisionRule;
}
interface RawStep {
  key: string;
  name: string;
  kind: StepKind;
  params: StepParams;
  limits: RawLimit[];
}

/** Limits written as nominal ± tolerance come out at 12 significant digits, so 5 × 1.02 gives 5.1, not 5.1000000000000005. */
function tidy(x: number): number {
  return Number(x.toPrecision(12));
}

/** Relative slack for comparing currents and voltages written in a plan against ratings (rounding only). */
const RATING_SLACK = 1e-9;

function checkSteps(steps: RawStep[], product: PlanProduct | undefined, prefix: Seg[]): { issues: RawIssue[]; steps: PlanStep[] } {
  const issues: RawIssue[] = [];
  const at = (segs: Seg[], message: string, atKey = false) => issues.push({ segs: [...prefix, ...segs], message, atKey });
  const firstUse = new Map<string, number>();
  const out: PlanStep[] = [];

  steps.forEach((step, i) => {
    const s: Seg[] = [i];
    const previous = firstUse.get(step.key);
    if (previous !== undefined) at([...s, 'key'], `duplicate step key "${step.key}" (already used by steps[${previous}])`);
    else firstUse.set(step.key, i);

    const p = step.params;
    const allowed = KIND_PARAMS[step.kind];
    for (const name of Object.keys(p)) {
      if (!allowed.includes(name as keyof StepParams)) {
        at([...s, 'params', name], `is not used by a step of kind ${step.kind} (it reads: ${allowed.join(', ')})`, true);
      }
    }
    checkParams(step, product, (segs, message) => at([...s, 'params', ...segs], message));

    const infos = KIND_QUANTITY_INFO[step.kind];
    const limits: LimitSpec[] = [];
    const limitKeys: { base: string; atA?: number; j: number }[] = [];
    step.limits.forEach((limit, j) => {
      const l: Seg[] = [...s, 'limits', j];
      const { keyOk, spec } = checkLimit(step, limit, infos, product, (segs, message) => at([...l, ...segs], message));
      if (keyOk) {
        const { base, atA } = splitLimitKey(limit.key);
        const twin = limitKeys.find((k) => k.base === base && (k.atA === undefined ? atA === undefined : atA !== undefined && sameLoad(k.atA, atA)));
        if (twin) at([...l, 'key'], `duplicate limit "${limit.key}" (already given as limits[${twin.j}])`);
        else limitKeys.push({ base, atA, j });
      }
      if (spec) limits.push(spec);
    });

    // a per-load quantity measured without a limit would be taken and thrown away: ask for the limit
    for (const info of infos.filter((q) => q.perLoad)) {
      (p.loadsA ?? []).forEach((load, k) => {
        if (!limitKeys.some((lk) => lk.base === info.base && lk.atA !== undefined && sameLoad(lk.atA, load))) {
          at([...s, 'params', 'loadsA', k], `load ${load} A has no limit; add a limit with key ${info.base}@${load}`);
        }
      });
    }

    const params: StepParams = {};
    for (const name of allowed) if (p[name] !== undefined) (params as Record<string, unknown>)[name] = p[name];
    out.push({ key: step.key, name: step.name, kind: step.kind, params, limits });
  });
  return { issues, steps: out };
}

function checkParams(step: RawStep, product: PlanProduct | undefined, at: (segs: Seg[], message: string) => void): void {
  const p = step.params;
  const rated = product?.ioutRatedA;
  const current = (segs: Seg[], a: number | undefined) => {
    if (a === undefined || rated === undefined) return;
    if (a > rated * (1 + RATING_SLACK)) at(segs, `${a} A is above the rated output current of ${product!.partNumber} (${rated} A)`);
  };
  const inputV = (segs: Seg[], v: number | undefined) => {
    if (v === undefined || !product) return;
    if (v < product.vinMinV * (1 - RATING_SLACK) || v > product.vinMaxV * (1 + RATING_SLACK)) {
      at(segs, `${v} V is outside the input range of ${product.partNumber} (${product.vinMinV}–${product.vinMaxV} V)`);
    }
  };

  current(['loadA'], p.loadA);
  current(['fromA'], p.fromA);
  current(['toA'], p.toA);
  (p.loadsA ?? []).forEach((a, k) => current(['loadsA', k], a));
  inputV(['vinV'], p.vinV);
  (p.vinsV ?? []).forEach((v, k) => inputV(['vinsV', k], v));

  if (p.loadsA) {
    p.loadsA.forEach((a, k) => {
      const first = p.loadsA!.findIndex((b) => sameLoad(a, b));
      if (first < k) at(['loadsA', k], `load ${a} A is listed twice (see loadsA[${first}])`);
      if (step.kind === 'efficiency' && a <= 0) at(['loadsA', k], 'efficiency needs a load above 0 A (no output power at 0 A)');
    });
  }
  if (step.kind === 'line_regulation' && p.vinsV && new Set(p.vinsV).size < 2) {
    at(['vinsV'], 'needs at least two different input voltages');
  }
  if (step.kind === 'load_regulation' && p.loadA !== undefined && p.loadA <= 0) {
    at(['loadA'], 'load regulation needs a full-load current above 0 A');
  }
  if (step.kind === 'load_step' && p.fromA !== undefined && p.toA !== undefined && sameLoad(p.fromA, p.toA)) {
    at(['toA'], `must differ from fromA (${p.fromA} A) for a load step`);
  }
  if (p.bandwidthHz !== undefined && p.sampleRateHz !== undefined && p.bandwidthHz >= p.sampleRateHz / 2) {
    at(
      ['bandwidthHz'],
      `${p.bandwidthHz} Hz is not below half the sample rate (${p.sampleRateHz / 2} Hz), so the bandwidth limit would do nothing; raise sampleRateHz or lower bandwidthHz`,
    );
  }
  if (step.kind === 'protection' && p.overloadA !== undefined && rated !== undefined && p.overloadA <= rated) {
    at(['overloadA'], `${p.overloadA} A is not an overload: it must be above the rated ${rated} A of ${product!.partNumber}`);
  }
}

function checkLimit(
  step: RawStep,
  limit: RawLimit,
  infos: QuantityInfo[],
  product: PlanProduct | undefined,
  at: (segs: Seg[], message: string) => void,
): { keyOk: boolean; spec?: LimitSpec } {
  const { base, atA } = splitLimitKey(limit.key);
  const info = infos.find((q) => q.base === base);
  if (!info) {
    const names = infos.map((q) => (q.perLoad ? `${q.base}@<load>` : q.base)).join(', ');
    at(['key'], `"${limit.key}" is not a quantity of a step of kind ${step.kind}; use ${names}`);
    return { keyOk: false };
  }
  if (info.perLoad) {
    if (atA === undefined || Number.isNaN(atA)) {
      at(['key'], `must name its load, e.g. ${base}@${step.params.loadsA?.[0] ?? 1.5}`);
      return { keyOk: false };
    }
    if (!(step.params.loadsA ?? []).some((a) => sameLoad(a, atA))) {
      at(['key'], `names ${atA} A, which is not in params.loadsA (${(step.params.loadsA ?? []).join(', ')})`);
      return { keyOk: false };
    }
  } else if (atA !== undefined) {
    at(['key'], `${base} is not measured per load; write it without "@"`);
    return { keyOk: false };
  }

  let ok = true;
  const fail = (segs: Seg[], message: string) => {
    ok = false;
    at(segs, message);
  };
  let unit = info.unit;
  if (limit.unit !== undefined) {
    const written = limit.unit === 'us' ? 'µs' : limit.unit;
    if (written !== info.unit) fail(['unit'], `must be "${info.unit}" for ${base} (or leave it out)`);
    unit = info.unit;
  }

  let low = limit.low;
  let high = limit.high;
  if (limit.nominal !== undefined) {
    if (low !== undefined || high !== undefined) {
      fail([low !== undefined ? 'low' : 'high'], 'write either low/high or nominal with a tolerance, not both');
    }
    if (limit.tolerance !== undefined && limit.tolerancePct !== undefined) {
      fail(['tolerancePct'], 'give tolerance (absolute) or tolerancePct (percent of nominal), not both');
    } else if (limit.tolerance === undefined && limit.tolerancePct === undefined) {
      fail(['nominal'], 'needs tolerance (absolute) or tolerancePct (percent of nominal)');
    } else {
      const tol = limit.tolerance ?? Math.abs(limit.nominal) * (limit.tolerancePct! / 100);
      low = tidy(limit.nominal - tol);
      high = tidy(limit.nominal + tol);
    }
  } else if (low === undefined && high === undefined) {
    fail(['high'], 'a limit needs low, high, or nominal with a tolerance');
  }

  if (low !== undefined && high !== undefined) {
    if (info.flag ? low > high : low >= high) {
      fail(['high'], `must be above low (${low}); got high ${high}`);
    }
  }
  if (info.flag && ok) {
    const accepts = (v: number) => (low === undefined || v >= low) && (high === undefined || v <= high);
    if (accepts(0) === accepts(1)) {
      fail(['low'], `${base} is 1 (yes) or 0 (no); its limits must accept exactly one of them, e.g. low: 1, high: 1`);
    }
  }

  const rule: DecisionRule = limit.rule ?? 'simple';
  const uncertainty = limit.uncertainty ?? 0;
  if (ok && rule === 'guarded') {
    if (uncertainty === 0) {
      fail(['uncertainty'], 'the guarded rule needs the expanded uncertainty U (k = 2) above 0; use rule: simple otherwise');
    } else {
      try {
        guardedLimits({ low, high, uncertainty, rule });
      } catch (err) {
        fail(['uncertainty'], (err as Error).message);
      }
    }
  }

  // a voltage limit that excludes the product's own nominal output is almost always a copy from another product
  if (ok && product && base === 'voutV') {
    const v = product.voutNomV;
    if ((low !== undefined && v < low) || (high !== undefined && v > high)) {
      fail(limit.nominal !== undefined ? ['nominal'] : ['low'], `limits ${low ?? '−∞'}…${high ?? '+∞'} V do not contain the nominal output ${v} V of ${product.partNumber}`);
    }
  }

  if (!ok) return { keyOk: true };
  const name = limit.name ?? info.name.replace('{load}', String(atA));
  const spec: LimitSpec = { key: limit.key, name, unit, uncertainty, rule };
  if (low !== undefined) spec.low = low;
  if (high !== undefined) spec.high = high;
  return { keyOk: true, spec };
}

// ---------------------------------------------------------------------------------------------------------
// positions

function pathString(segs: Seg[]): string {
  let s = '';
  for (const seg of segs) s += typeof seg === 'number' ? `[${seg}]` : `${s ? '.' : ''}${seg}`;
  return s || '(file)';
}

/** Line and column of the node a path names, or of its nearest existing parent when the field is missing. */
function locate(doc: Document, lc: LineCounter, segs: Seg[], atKey: boolean): { line: number; column: number } {
  let node: unknown = doc.contents;
  let offset = (node as { range?: number[] } | null)?.range?.[0] ?? 0;
  for (let k = 0; k < segs.length; k++) {
    const seg = segs[k];
    if (isMap(node)) {
      const pair = node.items.find((it) => (isScalar(it.key) ? it.key.value : it.key) === seg);
      if (!pair) break;
      const keyOffset = (pair.key as { range?: number[] } | null)?.range?.[0];
      if (k === segs.length - 1 && atKey && keyOffset !== undefined) {
        offset = keyOffset;
        break;
      }
      node = pair.value;
      offset = (node as { range?: number[] } | null)?.range?.[0] ?? keyOffset ?? offset;
    } else if (isSeq(node) && typeof seg === 'number') {
      const item = node.items[seg];
      if (item === undefined) break;
      node = item;
      offset = (item as { range?: number[] } | null)?.range?.[0] ?? offset;
    } else {
      break;
    }
  }
  const pos = lc.linePos(offset);
  return { line: pos.line, column: pos.col };
}

// ---------------------------------------------------------------------------------------------------------
// entry points

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
  const data: unknown = doc.toJS({ maxAliasCount: 100 });
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
