import { screen, within } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { renderApp } from '@/testing/render';
import type { PlanComparison, WhatIfResult } from '../api/types';
import { ComparisonTable } from './version-comparison';
import { WhatIfSummary } from './what-if-panel';

const comparison: PlanComparison = {
  fromVersion: 1,
  toVersion: 2,
  added: [{ key: 'ripple-light', name: 'Ripple at light load', position: 9 }],
  removed: [{ key: 'ripple', name: 'Ripple', position: 7 }],
  reordered: [{ key: 'line-regulation', name: 'Line regulation', from: 5, to: 4 }],
  changed: [{ key: 'vout-load', name: 'Output voltage', changes: [{ field: 'limits[voutV@1.5].high', before: 5.1, after: 5.04 }] }],
  settings: [{ field: 'maxAttempts', before: 3, after: 2 }],
  identical: false,
};

const result: WhatIfResult = {
  planVersionId: 7,
  elapsedMs: 12,
  scopeText: 'lot L-1',
  unitsInScope: 9,
  measurementsJudged: 16,
  passToFail: 3,
  failToPass: 1,
  unknown: 1,
  perStep: [],
  perLimit: [{ stepKey: 'vout-load', stepName: 'Output voltage under load', limitKey: 'voutV@1.5', limitName: 'Output voltage at 1.5 A', unit: 'V', passToFail: 2, failToPass: 2, measured: 9 }],
  unmeasuredLimits: [],
  currentFpy: { x: 4, n: 9, estimate: 4 / 9, lower: 0.189, upper: 0.733, confidence: 0.95, method: 'Wilson score' },
  predictedFpy: { x: 2, n: 8, estimate: 0.25, lower: 0.0715, upper: 0.5907, confidence: 0.95, method: 'Wilson score' },
  affected: [{ unitId: 3, serial: 'K5A-2647-00003', runId: 42, before: 'pass', after: 'fail', limits: [{ stepKey: 'vout-load', limitKey: 'voutV@1.5', value: 5.045, before: 'pass', after: 'fail' }] }],
};

describe('plan comparison and what-if summary', () => {
  it('shows every kind of change with its old and new value', () => {
    renderApp(<ComparisonTable c={comparison} />);
    const table = screen.getByRole('table', { name: 'Changes from version 1 to version 2' });
    const rows = within(table).getAllByRole('row').slice(1).map((r) => r.textContent);
    expect(rows).toEqual([
      'Step addedRipple at light load (ripple-light)—position 9',
      'Step removedRipple (ripple)position 7—',
      'Step movedLine regulation (line-regulation)position 5position 4',
      'ChangedOutput voltage · limits[voutV@1.5].high5.15.04',
      'SettingmaxAttempts32',
    ]);
  });

  it('summarises the verdict changes and links affected units to their runs', () => {
    renderApp(<WhatIfSummary r={result} />);
    const summary = screen.getByLabelText('What-if summary');
    expect(summary.textContent).toMatch(/Re-judged 16 stored measurements of 9 units \(lot L-1\)/);
    expect(summary.textContent).toMatch(/25\.0 % \(95 % CI 7\.1 % … 59\.1 %, 2 of 8\)/);
    expect(screen.getByRole('link', { name: 'K5A-2647-00003' }).getAttribute('href')).toBe('/runs/42');
    expect(screen.getByText(/1 unit\(s\) cannot be predicted/)).toBeTruthy();
  });
});
