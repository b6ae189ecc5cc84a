import { act, screen, within } from '@testing-library/react';
import { useQuery } from '@tanstack/react-query';
import { describe, expect, it } from 'vitest';
import { renderApp } from '@/testing/render';
import { runFromStarted, withFinished, withMeasurement, withStepStarted, type LiveRun } from '../live-run';
import { measurementFor, sampleRun, sampleSteps, sampleUnit } from '../test-data';
import { StepList } from './step-list';

const KEY = ['test', 'live-run'] as const;

/** The step list reading the run from the query cache, as on the station screen. */
function CachedStepList() {
  // the test writes the cache, as the socket hook does on the station screen; the fetch never answers
  const q = useQuery<LiveRun>({ queryKey: KEY, queryFn: () => new Promise<LiveRun>(() => {}), staleTime: Infinity });
  return q.data ? <StepList live={q.data} /> : null;
}

/** Query observers tell React on a zero-delay timer; waiting it out inside act() flushes the render. */
const settle = () => new Promise((r) => setTimeout(r, 0));

async function setup() {
  const r = renderApp(<CachedStepList />);
  const put = (fn: (live: LiveRun) => LiveRun) =>
    act(async () => {
      r.queryClient.setQueryData<LiveRun>(KEY, (old) => fn(old!));
      await settle();
    });
  await act(async () => {
    r.queryClient.setQueryData<LiveRun>(KEY, runFromStarted({ stationId: 1, emittedAt: 1, run: sampleRun, unit: sampleUnit, steps: sampleSteps }));
    await settle();
  });
  return { ...r, put };
}

const judged = (m: ReturnType<typeof measurementFor>) => ({ stationId: 1, emittedAt: Date.now(), runId: sampleRun.id, stepKey: m.stepKey, measurement: m });

describe('StepList', () => {
  it('lays out one row per limit, with limits, before any value arrives', async () => {
    await setup();
    const table = screen.getByRole('table', { name: 'Test steps' });
    const rows = within(table).getAllByRole('row');
    // header + 1 + 2 + 2 limit rows
    expect(rows).toHaveLength(6);
    expect(screen.getByTestId('row-vout-load|voutV@1.5')).toHaveTextContent('4.900 … 5.100 V');
    expect(screen.getByTestId('row-iin-no-load|iinNoLoadMa')).toHaveTextContent('≤ 15.0 mA');
    expect(screen.getByTestId('row-protection|foldback')).toHaveTextContent('must be yes');
    // values not there yet: a dash, in the same cell that will hold the number
    for (const row of rows.slice(1)) expect(row.querySelector('[data-measured="no"]')).not.toBeNull();
  });

  it('fills values into the rows already there as measurements stream in (no row added, none replaced)', async () => {
    const { put } = await setup();
    const before = screen.getAllByRole('row');
    const cellBefore = screen.getByTestId('row-vout-load|voutV@3').querySelector('[data-figure]');

    await put((l) => withStepStarted(l, { stationId: 1, emittedAt: 2, runId: sampleRun.id, stepKey: 'iin-no-load', stepIndex: 0 }));
    expect(screen.getByTestId('row-iin-no-load|iinNoLoadMa')).toHaveTextContent('measuring…');
    expect(screen.getByTestId('row-iin-no-load|iinNoLoadMa').closest('tbody')).toHaveAttribute('data-current', 'yes');

    await put((l) => withMeasurement(l, judged(measurementFor(0, 'iinNoLoadMa', 8.24))));
    await put((l) => withMeasurement(l, judged(measurementFor(1, 'voutV@1.5', 5.0123))));
    await put((l) => withMeasurement(l, judged(measurementFor(1, 'voutV@3', 4.9876))));

    const after = screen.getAllByRole('row');
    expect(after).toHaveLength(before.length);
    after.forEach((row, i) => expect(row).toBe(before[i]));
    const cellAfter = screen.getByTestId('row-vout-load|voutV@3').querySelector('[data-figure]');
    expect(cellAfter).toBe(cellBefore);
    expect(cellAfter).toHaveAttribute('data-measured', 'yes');
    expect(cellAfter).toHaveTextContent('4.988V');
    expect(screen.getByTestId('row-iin-no-load|iinNoLoadMa')).toHaveTextContent('8.2mA');
    expect(within(screen.getByTestId('row-iin-no-load|iinNoLoadMa')).getByText('PASS')).toBeInTheDocument();
  });

  it('shows the guarded limits once known, in a line reserved from the start', async () => {
    const { put } = await setup();
    const guardLine = screen.getByTestId('row-vout-load|voutV@1.5').querySelector('[data-visible]');
    expect(guardLine).toHaveAttribute('data-visible', 'no');
    await put((l) => withMeasurement(l, judged(measurementFor(1, 'voutV@1.5', 5.095, 'guard_fail'))));
    const row = screen.getByTestId('row-vout-load|voutV@1.5');
    expect(row.querySelector('[data-visible]')).toBe(guardLine);
    expect(guardLine).toHaveAttribute('data-visible', 'yes');
    expect(guardLine).toHaveTextContent('guard 4.910 … 5.090 V');
    // the guard-band verdict is a FAIL with its own words, so nobody mistakes it for a gross failure
    expect(row).toHaveTextContent('FAIL');
    expect(row).toHaveTextContent('inside spec, outside guard band');
  });

  it('writes yes/no results as words and marks steps not reached when the run ends', async () => {
    const { put } = await setup();
    const failure = measurementFor(0, 'iinNoLoadMa', 22.5, 'fail');
    await put((l) => withMeasurement(l, judged(failure)));
    await put((l) =>
      withFinished(l, { stationId: 1, emittedAt: 3, runId: sampleRun.id, verdict: 'fail', failedStepKey: 'iin-no-load', failures: [failure], durationMs: 1000, unit: sampleUnit }),
    );
    expect(screen.getByTestId('row-iin-no-load|iinNoLoadMa')).toHaveTextContent('FAIL');
    expect(screen.getByTestId('row-protection|foldback')).toHaveTextContent('not run');
    expect(screen.getByTestId('row-iin-no-load|iinNoLoadMa').closest('tbody')).toHaveAttribute('data-current', 'no');
  });

  it('writes a judged value, its limits and its acceptance limits at the same digits (92.96 against ≥ 93.00)', async () => {
    const { put } = await setup();
    // a value that rounds onto its limit at the usual one decimal: the shared formatter adds the digit
    await put((l) => withMeasurement(l, judged(measurementFor(0, 'iinNoLoadMa', 15.04, 'fail'))));
    const row = screen.getByTestId('row-iin-no-load|iinNoLoadMa');
    expect(row).toHaveTextContent('15.04mA');
    expect(row).toHaveTextContent('≤ 15.00 mA');
    // guarded limits at the precision they were computed, value at the same digits
    await put((l) => withMeasurement(l, judged(measurementFor(1, 'voutV@3', 5.0912, 'guard_fail', { guardedLow: 4.9105, guardedHigh: 5.0895 }))));
    const guarded = screen.getByTestId('row-vout-load|voutV@3');
    expect(guarded).toHaveTextContent('5.0912V');
    expect(guarded).toHaveTextContent('4.9000 … 5.1000 V');
    expect(guarded).toHaveTextContent('guard 4.9105 … 5.0895 V');
  });

  it("shows each judged value's decision statement in words, on a line kept from the start", async () => {
    const { put } = await setup();
    const row = () => screen.getByTestId('row-iin-no-load|iinNoLoadMa');
    const line = within(row()).getByTestId('decision');
    expect(line).toHaveAttribute('data-visible', 'no');
    const m = { ...measurementFor(0, 'iinNoLoadMa', 14.9), decision: 'conditional_pass' } as ReturnType<typeof measurementFor>;
    await put((l) => withMeasurement(l, judged(m)));
    expect(within(row()).getByTestId('decision')).toBe(line);
    expect(line).toHaveAttribute('data-visible', 'yes');
    expect(line).toHaveTextContent('pass, within uncertainty');
  });
});
