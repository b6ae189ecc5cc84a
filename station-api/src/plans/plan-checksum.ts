import { createHash } from 'node:crypto';
import type { PlanStep } from './plan-definition';

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
