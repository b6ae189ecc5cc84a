/** What the statistics refresh needs of a connection: the ORM's `execute`. */
export interface SqlRunner {
  execute(sql: string, params?: unknown[]): Promise<unknown>;
}

/**
 * Rows ANALYZE samples per index. Bounds the refresh to milliseconds at a year of history (100,000 runs,
 * 1.4 million measurements) while giving the planner the row counts and selectivities it lacks
 * (SQLite documentation, "ANALYZE", §2 approximate ANALYZE for large databases; 400–1000 recommended).
 */
export const ANALYSIS_LIMIT = 1000;

/** How often a long-running server refreshes the statistics: history grows by a few thousand runs a shift. */
export const REFRESH_EVERY_MS = 6 * 60 * 60 * 1000;

/**
 * Gives SQLite's query planner current statistics (sqlite_stat1). Without them it guesses, and at plant scale
 * it guessed wrong (a per-lot mean on the step index: 355 ms instead of 1–2 ms, issue 11). ANALYZE with an
 * analysis limit rather than `PRAGMA optimize` alone: the bundled SQLite (3.44) only re-analyzes from
 * `optimize` tables this connection has already queried, so at start-up it would do nothing.
 * `bench:floor` times every floor query before and after this, so a plan made worse by the statistics shows.
 */
export async function refreshPlannerStatistics(conn: SqlRunner): Promise<{ ms: number }> {
  const t0 = Date.now();
  await conn.execute(`PRAGMA analysis_limit = ${ANALYSIS_LIMIT}`);
  await conn.execute('ANALYZE');
  // the planner of this (single, pooled) connection reads the new statistics on its next statement
  await conn.execute('PRAGMA optimize');
  return { ms: Date.now() - t0 };
}
