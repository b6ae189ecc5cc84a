import { screen } from '@testing-library/react';
import type { StationState } from '@station-events';
import { describe, expect, it } from 'vitest';
import { renderApp } from '@/testing/render';
import { verdictLooks } from '@/theme';
import { stationStateLooks } from './station-state-look';
import { StationStateMark } from './station-state-mark';

const states: StationState[] = ['idle', 'ready', 'testing', 'fault', 'blocked'];

describe('StationStateMark', () => {
  it.each(states)('%s shows its word and its shape', (state) => {
    const { container } = renderApp(<StationStateMark state={state} />);
    expect(screen.getByText(stationStateLooks[state].word)).toBeInTheDocument();
    expect(container.querySelector('svg')).toHaveAttribute('data-shape', stationStateLooks[state].shape);
  });

  it('never draws "ready" with the PASS shape, so a ready station is not read as a passed unit', () => {
    expect(stationStateLooks.ready.shape).not.toBe(verdictLooks.pass.shape);
    expect(new Set(states.map((s) => stationStateLooks[s].shape)).size).toBe(states.length);
    expect(new Set(states.map((s) => stationStateLooks[s].word)).size).toBe(states.length);
  });
});
