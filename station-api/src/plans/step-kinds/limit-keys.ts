import type { Quantity } from './types';

/**
 * Limit keys: a quantity name, and for a per-load quantity `@` and the load in amperes. One rule everywhere
 * (the generated plan schema, the plan checks and the engine): the load is a plain decimal number, with an
 * optional trailing `A` or `a`. `voutV@1.5`, `voutV@1.50A` and `efficiencyPct@1.5a` name the same 1.5 A;
 * `voutV@` (no load) and `voutV@1e1` are refused.
 */
const LOAD_TEXT = '(?:[0-9]+(?:\\.[0-9]+)?|\\.[0-9]+)[Aa]?';
export const LIMIT_KEY_PATTERN = `^[A-Za-z]+(?:@${LOAD_TEXT})?$`;
const LOAD_RE = new RegExp(`^${LOAD_TEXT}$`);

/**
 * Splits a limit key into its quantity and load: `voutV@1.5` and `efficiencyPct@1.5A` → voutV, 1.5.
 * @returns `atA` undefined without `@`, NaN when the text after `@` is not a load
 */
export function parseLimitKey(key: string): { base: string; atA?: number } {
  const at = key.indexOf('@');
  if (at < 0) return { base: key };
  const text = key.slice(at + 1);
  return { base: key.slice(0, at), atA: LOAD_RE.test(text) ? Number(text.replace(/a$/i, '')) : Number.NaN };
}

/** Loads compare numerically, so `@1.5`, `@1.50` and `@1.5A` name the same load. */
export function sameLoad(a: number, b: number): boolean {
  return Math.abs(a - b) < 1e-9;
}

/** Finds the quantity a limit judges; a key whose load cannot be read finds nothing (and so fails). */
export function quantityFor(key: string, quantities: Quantity[]): Quantity | undefined {
  const { base, atA } = parseLimitKey(key);
  return quantities.find((q) => q.base === base && (atA === undefined ? q.atA === undefined : q.atA !== undefined && sameLoad(q.atA, atA)));
}

/** The key of a quantity as a limit names it: `voutV`, `efficiencyPct@1.5`. */
export function quantityKey(q: Pick<Quantity, 'base' | 'atA'>): string {
  return q.atA === undefined ? q.base : `${q.base}@${q.atA}`;
}
