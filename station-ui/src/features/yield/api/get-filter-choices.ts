import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { yieldApiPaths } from './yield-filters';

/** A choice in the filter bar: the id to send and the words to show. */
export interface FilterChoice {
  value: string;
  label: string;
  /** the product a lot belongs to (lots only) */
  productId?: string;
}

interface LotRow {
  id: number;
  code: string;
  product: { id: number; partNumber: string };
}
interface ProductRow {
  id: number;
  partNumber: string;
  name: string;
}
interface StationRow {
  id: number;
  code: string;
  name: string;
}

const byLabel = (a: FilterChoice, b: FilterChoice) => a.label.localeCompare(b.label, undefined, { numeric: true });

/** `GET /api/lots`, `GET /api/products` and `GET /api/stations`, as the filter bar offers them. */
export async function getFilterChoices(signal?: AbortSignal): Promise<{ lots: FilterChoice[]; products: FilterChoice[]; stations: FilterChoice[] }> {
  const [lots, products, stations] = await Promise.all([
    api.get<LotRow[]>(yieldApiPaths.lots, { signal }),
    api.get<ProductRow[]>(yieldApiPaths.products, { signal }),
    api.get<StationRow[]>(yieldApiPaths.stations, { signal }),
  ]);
  return {
    lots: lots.map((l) => ({ value: String(l.id), label: `${l.code} (${l.product.partNumber})`, productId: String(l.product.id) })).sort(byLabel),
    products: products.map((p) => ({ value: String(p.id), label: `${p.partNumber} — ${p.name}` })).sort(byLabel),
    stations: stations.map((s) => ({ value: String(s.id), label: s.code })).sort(byLabel),
  };
}

export const filterChoicesQueryOptions = () =>
  queryOptions({
    queryKey: ['yield-filter-choices'] as const,
    queryFn: ({ signal }) => getFilterChoices(signal),
    staleTime: 60_000,
  });

export function useFilterChoices() {
  return useQuery(filterChoicesQueryOptions());
}
