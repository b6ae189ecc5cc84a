/**
 * The step-kind registry: one file per kind (parameters, quantities with units and physical ranges, limit keys,
 * fixture sequence, computation), read by the plan checks, the run engine, the generated plan schema and the docs.
 */
export { parseLimitKey, quantityFor, quantityKey, sameLoad, LIMIT_KEY_PATTERN } from './limit-keys';
export { runStep } from './run-step';
export { stepProblems } from './step-problems';
export { ALL_STEP_KINDS, quantityDef, STEP_KIND_DEFS, stepKindDef } from './registry';
export { emptyZoneProblem, implausibility } from './ranges';
export { OUTPUT_PRESENT_FRACTION } from './fixture-ops';
export { PARAMS } from './params';
export type { PhysicalRange, ProductRatings, Quantity, QuantityDef, StepContext, StepKindDef } from './types';
