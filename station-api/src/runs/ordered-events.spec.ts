import { describe, expect, it } from 'vitest';
import { StationEventsPublisher } from '../realtime/station-events.publisher';
import { OrderedEvents } from './ordered-events';

describe('OrderedEvents', () => {
  it('keeps a run’s events in order while a write is still committing, and records a failed write', async () => {
    const publisher = new StationEventsPublisher();
    const seen: string[] = [];
    publisher.subscribe((name, p) => seen.push(`${name}:${(p as { stepKey?: string }).stepKey ?? ''}`));
    const ordered = new OrderedEvents(publisher);
    let commit!: (id: number) => void;
    const write = new Promise<number>((resolve) => (commit = resolve));
    ordered.emit('step:started', { stationId: 1, runId: 7, stepKey: 'a', stepIndex: 0 });
    ordered.emitWhen(write, 'measurement:judged', (id) => ({ stationId: 1, runId: 7, stepKey: 'a', measurement: { id } as never }));
    ordered.emit('step:started', { stationId: 1, runId: 7, stepKey: 'b', stepIndex: 1 });
    ordered.emitWhen(Promise.reject(new Error('disk full')), 'measurement:judged', () => ({ stationId: 1, runId: 7, stepKey: 'b', measurement: {} as never }));
    await new Promise((r) => setTimeout(r, 10));
    expect(seen).toEqual(['step:started:a']);
    commit(42);
    await ordered.drain();
    expect(seen).toEqual(['step:started:a', 'measurement:judged:a', 'step:started:b']);
    expect(ordered.error?.message).toBe('disk full');
  });
});
