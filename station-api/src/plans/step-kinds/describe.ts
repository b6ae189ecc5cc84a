import { PARAMS } from './params';
import { ALL_STEP_KINDS } from './registry';

/**
 * The registry as data for the plan editor (GET /api/plan-step-kinds): which parameters each kind reads, with
 * unit, meaning and bounds (JSON Schema, as the loader checks them), and which quantities it produces, with
 * unit and physical range. The editor builds its forms from this and never keeps a rule of its own.
 */
export interface StepKindDescription {
  kind: string;
  summary: string;
  sequence: string;
  params: { name: string; need: 'required' | 'optional'; unit: string; description: string; schema: Record<string, unknown>; rating: string | null }[];
  quantities: {
    base: string;
    unit: string;
    name: string;
    perLoad: boolean;
    flag: boolean;
    /** The range in words and the law behind it */
    range: { text: string; law: string; min: number | null; max: number | null };
    /** Key to write in a limit: `voutV`, or `voutV@<load>` for a per-load quantity */
    limitKey: string;
  }[];
}

export function describeStepKinds(): StepKindDescription[] {
  return ALL_STEP_KINDS.map((def) => ({
    kind: def.kind,
    summary: def.summary,
    sequence: def.sequence,
    params: Object.entries(def.params).map(([name, need]) => {
      const p = PARAMS[name as keyof typeof PARAMS];
      return { name, need: need as 'required' | 'optional', unit: p.unit, description: p.description, schema: p.schema, rating: p.rating ?? null };
    }),
    quantities: def.quantities.map((q) => ({
      base: q.base,
      unit: q.unit,
      name: q.name,
      perLoad: !!q.perLoad,
      flag: !!q.flag,
      // bounds that depend on the product or the step are given in words only
      range: { text: q.range.text, law: q.range.law, min: typeof q.range.min === 'number' ? q.range.min : null, max: typeof q.range.max === 'number' ? q.range.max : null },
      limitKey: q.perLoad ? `${q.base}@<load>` : q.base,
    })),
  }));
}
