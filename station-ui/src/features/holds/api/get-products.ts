import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiPaths } from '@/config/paths';
import { api } from '@/lib/api-client';
import type { ProductChoice } from './types';

export function getProducts(): Promise<ProductChoice[]> {
  return api.get<ProductChoice[]>(apiPaths.products);
}

export const productsQueryOptions = () => queryOptions({ queryKey: ['products'], queryFn: getProducts, staleTime: 60_000 });

export function useProducts() {
  return useQuery(productsQueryOptions());
}
