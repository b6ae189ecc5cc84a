/**
 * Moved: the step kinds live in plans/step-kinds (one registry). This re-export only keeps
 * runs/run-engine.service.ts compiling until its import is pointed at '../plans/step-kinds'; delete it then.
 */
export { parseLimitKey, quantityFor, runStep, stepProblems, type Quantity, type StepContext } from '../plans/step-kinds';
export type { ProductRatings } from '../plans/step-kinds';
