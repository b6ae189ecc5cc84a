import { describe, expect, it } from 'vitest';
import { RUN_SORT_KEYS, runOrderSql } from './run-queries';

describe('runOrderSql', () => {
  it('names every ORDER BY term once, for every sort both ways (regression: a repeated started_at made the planner sort every run)', () => {
    for (const sort of RUN_SORT_KEYS) {
      for (const dir of ['asc', 'desc'] as const) {
        const terms = runOrderSql(sort, dir)
          .replace(/^ order by /, '')
          .split(', ')
          .map((t) => t.replace(/ (asc|desc)$/, ''));
        expect(new Set(terms).size, `${sort} ${dir}: ${terms.join(', ')}`).toBe(terms.length);
      }
    }
  });

  it('breaks ties newest first, by start time and then id', () => {
    expect(runOrderSql('startedAt', 'desc')).toBe(' order by r.started_at desc, r.id desc');
    expect(runOrderSql('station', 'asc')).toBe(' order by s.code collate nocase asc, r.started_at desc, r.id desc');
  });
});
