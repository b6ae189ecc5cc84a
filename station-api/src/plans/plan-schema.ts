import { STEP_KINDS } from './plan-definition';
import { PARAMS } from './step-kinds/params';
import { LIMIT_KEY_PATTERN } from './step-kinds/limit-keys';
import { ALL_STEP_KINDS } from './step-kinds/registry';

/**
 * The JSON Schema of a plan file, built from the step-kind registry. test-plans/plan.schema.json is this object
 * written out by `npm run gen:plan-schema -w station-api` (plan-artifacts.spec.ts fails when the file drifts);
 * the loader validates against this object, not the file.
 */
export const PLAN_SCHEMA_ID = 'urn:railwright:test-plan:1';
export const PLAN_FORMAT = 'railwright-plan/1';

const HEADER = {
  type: 'object',
  additionalProperties: false,
  required: ['planCode', 'planName', 'partNumber', 'revision', 'reason', 'author', 'stopAtFirstFailure', 'maxAttempts'],
  properties: {
    planCode: { description: 'Unique code of the plan, kept across revisions', type: 'string', pattern: '^[A-Z0-9][A-Z0-9-]{1,39}$' },
    planName: { type: 'string', minLength: 3, maxLength: 120 },
    partNumber: { description: 'Part number of the product the plan tests', type: 'string', minLength: 1, maxLength: 40 },
    revision: { description: "The file's own revision counter; raise it with every change", type: 'integer', minimum: 1 },
    reason: { description: 'Why this revision exists', type: 'string', minLength: 3, maxLength: 500 },
    author: { type: 'string', minLength: 2, maxLength: 120 },
    stopAtFirstFailure: { description: 'true: the run ends at the first failed step; false: every step runs', type: 'boolean' },
    maxAttempts: { description: 'Runs a unit may have before it must go to repair', type: 'integer', minimum: 1, maximum: 10 },
  },
};

const LIMIT = {
  type: 'object',
  additionalProperties: false,
  required: ['key'],
  description: 'Either low and/or high, or nominal with tolerance (absolute) or tolerancePct (percent of nominal). Limits are inclusive.',
  properties: {
    key: {
      description: 'Quantity the step produces, e.g. voutV, rippleMvPp, efficiencyPct@1.5 (load in A, optional trailing A)',
      type: 'string',
      pattern: LIMIT_KEY_PATTERN,
    },
    name: { type: 'string', minLength: 2, maxLength: 120 },
    unit: { type: 'string', maxLength: 10 },
    low: { type: 'number' },
    high: { type: 'number' },
    nominal: { type: 'number' },
    tolerance: { description: '± in the quantity\'s unit', type: 'number', exclusiveMinimum: 0 },
    tolerancePct: { description: '± percent of nominal', type: 'number', exclusiveMinimum: 0, maximum: 100 },
    uncertainty: { description: "Expanded uncertainty U (k = 2) in the quantity's unit", type: 'number', minimum: 0 },
    rule: { description: 'simple (ILAC-G8 §4.2.1) or guarded (acceptance limits narrowed by U)', enum: ['simple', 'guarded'] },
  },
  dependencies: { tolerance: ['nominal'], tolerancePct: ['nominal'] },
};

/** The plan-file schema (JSON Schema draft-07). */
export function buildPlanSchema(): Record<string, unknown> {
  const params: Record<string, unknown> = {};
  for (const [name, def] of Object.entries(PARAMS)) {
    params[name] = { description: def.unit && def.unit !== 'points' ? `${def.description} (${def.unit})` : def.description, ...def.schema };
  }
  const perKind = ALL_STEP_KINDS.flatMap((def) => {
    const required = Object.entries(def.params)
      .filter(([, need]) => need === 'required')
      .map(([name]) => name);
    if (required.length === 0) return [];
    return [
      {
        if: { type: 'object', properties: { kind: { const: def.kind } }, required: ['kind'] },
        then: { properties: { params: { type: 'object', required } } },
      },
    ];
  });
  return {
    $schema: 'http://json-schema.org/draft-07/schema#',
    $id: PLAN_SCHEMA_ID,
    title: 'Railwright test plan file',
    description:
      'One end-of-line test plan for one product. Written in YAML; see docs/test-plan-format.md. Generated from the step-kind registry ' +
      '(station-api/src/plans/step-kinds) by `npm run gen:plan-schema -w station-api`; do not edit by hand. Checks that need more than one ' +
      "field (unique keys, low < high, guard bands, physical ranges, loads within the product's rating) are made by the loader, station-api/src/plans/plan-file.ts.",
    type: 'object',
    additionalProperties: false,
    required: ['format', 'header', 'steps'],
    properties: {
      format: { description: 'Format identifier and version of this file layout', const: PLAN_FORMAT },
      header: { $ref: '#/definitions/header' },
      steps: { $ref: '#/definitions/steps' },
    },
    definitions: {
      header: HEADER,
      steps: { type: 'array', minItems: 1, maxItems: 100, items: { $ref: '#/definitions/step' } },
      step: {
        type: 'object',
        additionalProperties: false,
        required: ['key', 'name', 'kind', 'params', 'limits'],
        properties: {
          key: { description: 'Short identifier, unique within the plan (lower case, digits, hyphens)', type: 'string', pattern: '^[a-z][a-z0-9-]{0,39}$' },
          name: { type: 'string', minLength: 2, maxLength: 120 },
          kind: { enum: [...STEP_KINDS] },
          params: { $ref: '#/definitions/params' },
          limits: { type: 'array', minItems: 1, maxItems: 20, items: { $ref: '#/definitions/limit' } },
        },
        allOf: perKind,
      },
      params: { type: 'object', additionalProperties: false, properties: params },
      limit: LIMIT,
    },
  };
}
