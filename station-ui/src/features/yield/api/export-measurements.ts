import { downloadCsv } from '@/lib/csv-download';
import { yieldApiPaths, yieldQuery, type YieldFilters } from './yield-filters';

export interface ExportScope {
  step?: string;
  quantity?: string;
  only?: 'all' | 'failing';
}

/**
 * `GET /api/yield/measurements.csv` as a Blob (RFC 4180 CSV).
 */
export async function exportMeasurements(filters: YieldFilters, scope: ExportScope = {}): Promise<{ blob: Blob; fileName: string }> {
  const params = new URLSearchParams({ ...yieldQuery(filters), ...Object.fromEntries(Object.entries(scope).filter(([, v]) => v)) });
  return downloadCsv(yieldApiPaths.measurementsCsv, params, 'the measurements', 'railwright-measurements.csv');
}
