import type { ParamName } from './types';

/**
 * Every step parameter once: unit, meaning and bounds (as JSON Schema, so the generated plan schema and the
 * checks of stored plans read the same numbers). `rating` marks values the loader checks against the product.
 */
export interface ParamDef {
  unit: string;
  description: string;
  schema: Record<string, unknown>;
  rating?: 'outputCurrent' | 'inputVoltage';
}

export const PARAMS: Record<ParamName, ParamDef> = {
  vinV: {
    unit: 'V',
    description: "Input voltage; default the product's nominal input",
    schema: { type: 'number', exclusiveMinimum: 0 },
    rating: 'inputVoltage',
  },
  loadA: { unit: 'A', description: 'Electronic-load current', schema: { type: 'number', minimum: 0 }, rating: 'outputCurrent' },
  loadsA: {
    unit: 'A',
    description: 'Loads to measure at, one quantity per load',
    schema: { type: 'array', minItems: 1, maxItems: 10, items: { type: 'number', minimum: 0 } },
    rating: 'outputCurrent',
  },
  vinsV: {
    unit: 'V',
    description: 'Input voltages of a line sweep',
    schema: { type: 'array', minItems: 2, maxItems: 10, items: { type: 'number', exclusiveMinimum: 0 } },
    rating: 'inputVoltage',
  },
  regulationDefinition: {
    unit: '',
    description: 'full_load: (V_NL − V_FL)/V_FL; nominal: (V_NL − V_FL)/V_nom; reference_load: largest deviation from the output at half of loadA',
    schema: { enum: ['full_load', 'nominal', 'reference_load'] },
  },
  settleMs: { unit: 'ms', description: 'Wait after setting source and load', schema: { type: 'integer', minimum: 0, maximum: 60000 } },
  samples: { unit: 'points', description: 'Capture length', schema: { type: 'integer', minimum: 16, maximum: 100000 } },
  sampleRateHz: { unit: 'Hz', description: 'Capture sample rate', schema: { type: 'number', exclusiveMinimum: 0 } },
  bandwidthHz: { unit: 'Hz', description: 'Software bandwidth limit before ripple is taken', schema: { type: 'number', exclusiveMinimum: 0 } },
  fromA: { unit: 'A', description: 'Load before the step', schema: { type: 'number', minimum: 0 }, rating: 'outputCurrent' },
  toA: { unit: 'A', description: 'Load after the step', schema: { type: 'number', minimum: 0 }, rating: 'outputCurrent' },
  recoveryBandPct: {
    unit: '%',
    description: 'Recovery band, ± percent of the nominal output',
    schema: { type: 'number', exclusiveMinimum: 0, maximum: 50 },
  },
  // an overload is above the rating by definition, so it is not checked against it
  overloadA: { unit: 'A', description: 'Overload current for the protection check', schema: { type: 'number', exclusiveMinimum: 0 } },
};

/** "at least 16", "above 0", "from 0 to 60000": a parameter's bounds in words, for the docs. */
export function boundsText(schema: Record<string, unknown>): string {
  const s = (schema.items as Record<string, unknown> | undefined) ?? schema;
  const parts: string[] = [];
  if (s.exclusiveMinimum !== undefined) parts.push(`> ${String(s.exclusiveMinimum)}`);
  if (s.minimum !== undefined) parts.push(`≥ ${String(s.minimum)}`);
  if (s.maximum !== undefined) parts.push(`≤ ${String(s.maximum)}`);
  if (s.type === 'integer') parts.push('whole number');
  if (Array.isArray(s.enum)) parts.push((s.enum as string[]).map((e) => `\`${e}\``).join(' / '));
  let text = parts.join(', ');
  if (schema.items) text = `list of ${String(schema.minItems)}–${String(schema.maxItems)}, each ${text}`;
  return text;
}
