/** What the benchmarks print about the bytes a measurement costs (issue 11: at most 250, captures excluded). */
export interface MeasurementStorageSize {
  measurements: number;
  /** page_count × page_size: the main file once the WAL is checkpointed, free pages included */
  fileBytes: number;
  /** pages on the free list (reused by new rows; VACUUM gives them back to the disk) */
  freeBytes: number;
  /** pages of the capture table and its index (dbstat), the part the figure leaves out */
  captureBytes: number;
  /** fileBytes / measurements */
  wholeFilePerMeasurement: number;
  /** (fileBytes - freeBytes - captureBytes) / measurements: every table and index but the captures */
  capturesExcludedPerMeasurement: number;
}

type Sql = (q: string, p?: unknown[]) => Promise<Record<string, unknown>[]>;

/** The capture table and its index (Migration20261203010000). */
export const CAPTURE_OBJECTS = ['step_captures', 'step_captures_run_id_step_index_index'] as const;

/**
 * Measures the storage of the open database. Needs SQLite's `dbstat` table (compiled into the sqlite3
 * package's SQLite); without it the capture bytes are unknown and the figure is not given (undefined).
 */
export async function measurementStorageSize(sql: Sql): Promise<MeasurementStorageSize | undefined> {
  const [{ n }] = await sql('select count(*) as n from measurement_values');
  const [{ page_count: pages, page_size: pageSize, freelist_count: free }] = await sql('select * from pragma_page_count, pragma_page_size, pragma_freelist_count');
  let captureBytes: number;
  try {
    const [{ b }] = await sql(`select coalesce(sum(pgsize), 0) as b from dbstat where name in (${CAPTURE_OBJECTS.map(() => '?').join(', ')})`, [...CAPTURE_OBJECTS]);
    captureBytes = Number(b);
  } catch {
    return undefined;
  }
  return storageFigures(Number(n), Number(pages), Number(pageSize), Number(free), captureBytes);
}

/** The arithmetic of {@link measurementStorageSize}, apart so it can be checked by hand. */
export function storageFigures(measurements: number, pages: number, pageSize: number, freePages: number, captureBytes: number): MeasurementStorageSize {
  const fileBytes = pages * pageSize;
  const freeBytes = freePages * pageSize;
  const per = (b: number) => (measurements > 0 ? b / measurements : 0);
  return {
    measurements,
    fileBytes,
    freeBytes,
    captureBytes,
    wholeFilePerMeasurement: per(fileBytes),
    capturesExcludedPerMeasurement: per(fileBytes - freeBytes - captureBytes),
  };
}

/** One line for a benchmark's output. */
export function describeStorageSize(s: MeasurementStorageSize): string {
  const mb = (b: number) => (b / 1e6).toFixed(1);
  return (
    `storage (issue 11, target <= 250): ${s.capturesExcludedPerMeasurement.toFixed(0)} bytes per measurement captures excluded ` +
    `(${mb(s.fileBytes)} MB in pages - ${mb(s.freeBytes)} MB free pages - ${mb(s.captureBytes)} MB capture table and its index by dbstat, / ${s.measurements} measurements); ` +
    `${s.wholeFilePerMeasurement.toFixed(0)} bytes per measurement whole file`
  );
}
