import { describe, expect, it } from 'vitest';
import { StationEventsPublisher } from '../realtime/station-events.publisher';
import { RunProgressTracker } from './run-progress.tracker';

describe('RunProgressTracker', () => {
  const setup = () => {
    const events = new StationEventsPublisher();
    const tracker = new RunProgressTracker(events);
    tracker.onModuleInit();
    return { events, tracker };
  };
  const run = { id: 7 } as never;

  it('follows a run from start through its steps to the finish', () => {
    const { events, tracker } = setup();
    events.emit('run:started', { stationId: 1, run, unit: {} as never, steps: [] });
    expect(tracker.progressOf(1, 7)).toEqual({ runId: 7, stepIndex: 0, stepKey: null });
    events.emit('step:started', { stationId: 1, runId: 7, stepKey: 'vout-load', stepIndex: 3 });
    expect(tracker.progressOf(1, 7)).toEqual({ runId: 7, stepIndex: 3, stepKey: 'vout-load' });
    expect(tracker.progressOf(1, 8)).toBeUndefined();
    expect(tracker.progressOf(2, 7)).toBeUndefined();
    events.emit('run:finished', { stationId: 1, runId: 7, verdict: 'pass', failures: [], durationMs: 5, unit: {} as never });
    expect(tracker.progressOf(1, 7)).toBeUndefined();
  });

  it('stops listening when the module is destroyed', () => {
    const { events, tracker } = setup();
    tracker.onModuleDestroy();
    events.emit('step:started', { stationId: 1, runId: 7, stepKey: 'x', stepIndex: 1 });
    expect(tracker.progressOf(1, 7)).toBeUndefined();
  });
});
