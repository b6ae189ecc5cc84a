export type { ProportionInterval } from '@contract/yield-views';
/** The filters every quality view shares, as they travel in the address and in each request. */
export interface YieldFilters {
  /** YYYY-MM-DD, first day included */
  from: string;
  /** YYYY-MM-DD, last day included */
  to: string;
  lotId: string;
  productId: string;
  stationId: string;
}

export const emptyYieldFilters: YieldFilters = { from: '', to: '', lotId: '', productId: '', stationId: '' };

const KEYS = Object.keys(emptyYieldFilters) as (keyof YieldFilters)[];

export function yieldFiltersFromParams(params: URLSearchParams): YieldFilters {
  const out = { ...emptyYieldFilters };
  for (const k of KEYS) out[k] = params.get(k) ?? '';
  return out;
}

/** The request's query: empty filters are left out. */
export function yieldQuery(f: YieldFilters): Record<string, string> {
  const out: Record<string, string> = {};
  for (const k of KEYS) if (f[k]) out[k] = f[k];
  return out;
}

/** Every yield query key starts with this, so one invalidation refreshes the whole screen. */
export const yieldQueryRoot = ['yield'] as const;

/** The API paths of the quality views (server: station-api/src/yield/yield.controller.ts). */
export const yieldApiPaths = {
  figures: '/yield/figures',
  pareto: '/yield/pareto',
  paretoUnits: '/yield/pareto/units',
  quantities: '/yield/quantities',
  capability: '/yield/capability',
  controlChart: '/yield/control-chart',
  measurementsCsv: '/yield/measurements.csv',
  products: '/products',
  lots: '/lots',
  stations: '/stations',
} as const;

