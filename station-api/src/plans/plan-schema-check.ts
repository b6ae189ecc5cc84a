import Ajv, { type ErrorObject, type ValidateFunction } from 'ajv';
import addFormats from 'ajv-formats';
import { pathString, type RawIssue, type Seg } from './plan-positions';
import { buildPlanSchema, PLAN_SCHEMA_ID } from './plan-schema';

/**
 * The schema pass of the plan checks: ajv against the schema built from the step-kind registry (the same object
 * test-plans/plan.schema.json is written from), with ajv's errors turned into plain words at a field path.
 */

let ajvInstance: Ajv | undefined;
export function schemaValidator(fragment?: 'steps' | 'step'): ValidateFunction {
  if (!ajvInstance) {
    // strictRequired off: the per-kind "then" branches name parameters that are defined once, under definitions/params
    ajvInstance = new Ajv({ allErrors: true, strict: true, strictRequired: false, allowUnionTypes: true });
    addFormats(ajvInstance);
    ajvInstance.addSchema(buildPlanSchema());
  }
  const ref = fragment ? `${PLAN_SCHEMA_ID}#/definitions/${fragment}` : PLAN_SCHEMA_ID;
  const fn = ajvInstance.getSchema(ref);
  if (!fn) throw new Error(`plan schema ${ref} not found`);
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

export function runSchema(validate: ValidateFunction, data: unknown, prefix: Seg[]): RawIssue[] {
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
