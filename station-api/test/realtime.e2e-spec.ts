import type { AddressInfo } from 'node:net';
import { io, Socket } from 'socket.io-client';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { JoinAck, StationEventMap, StationEventName } from '../src/realtime/station-events';
import { STATION_EVENT_NAMES } from '../src/realtime/station-events';
import { createTestApp, login, TestApp } from './create-test-app';
import { EngineHarness } from './engine-helpers';

/** socket.io on the server's port: signed-in handshake, rooms, and the event stream of a run. */
describe('live station events', () => {
  let t: TestApp;
  let h: EngineHarness;
  let url: string;
  const sockets: Socket[] = [];

  beforeAll(async () => {
    t = await createTestApp();
    await t.app.listen(0, '127.0.0.1');
    url = `http://127.0.0.1:${(t.app.getHttpServer().address() as AddressInfo).port}`;
    h = new EngineHarness(t, await login(t.app, 'operator'));
    await h.simulate('FX-101', { defectRates: {} });
  });
  afterAll(async () => {
    for (const s of sockets) s.disconnect();
    await t?.close();
  });

  function connect(token?: string): Socket {
    const s = io(url, { auth: token === undefined ? {} : { token }, transports: ['websocket'], reconnection: false, forceNew: true });
    sockets.push(s);
    return s;
  }

  function outcome(s: Socket): Promise<{ ok: true } | { ok: false; message: string; data: unknown }> {
    return new Promise((resolve) => {
      if (s.connected) return resolve({ ok: true });
      s.once('connect', () => resolve({ ok: true }));
      s.once('connect_error', (err: Error & { data?: unknown }) => resolve({ ok: false, message: err.message, data: err.data }));
    });
  }

  it('refuses a connection without a token, with a forged token and with garbage', async () => {
    const none = await outcome(connect());
    expect(none.ok).toBe(false);
    const jwtParts = h.token.split('.');
    const forged = `${jwtParts[0]}.${jwtParts[1]}.${'A'.repeat(jwtParts[2].length)}`;
    const bad = await outcome(connect(forged));
    expect(bad).toMatchObject({ ok: false, data: { code: 'unauthorized' } });
    expect((bad as { message: string }).message.length).toBeGreaterThan(10);
    expect((await outcome(connect('not-a-token'))).ok).toBe(false);
  });

  it('validates join messages', async () => {
    const s = connect(h.token);
    expect((await outcome(s)).ok).toBe(true);
    const ack = (await s.emitWithAck('station:join', { stationId: 'EOL-1' })) as JoinAck;
    expect(ack).toEqual({ ok: false, message: 'stationId must be a positive whole number, got "EOL-1"' });
    const none = (await s.emitWithAck('station:join', null)) as JoinAck;
    expect(none.ok).toBe(false);
  });

  it('streams a run to the station room in order, every payload stamped, and to the board', async () => {
    const station = await h.station('EOL-1');
    const stationSocket = connect(h.token);
    const boardSocket = connect(await login(t.app, 'quality'));
    expect((await outcome(stationSocket)).ok).toBe(true);
    expect((await outcome(boardSocket)).ok).toBe(true);
    const got: { name: StationEventName; payload: StationEventMap[StationEventName] }[] = [];
    const board: StationEventName[] = [];
    for (const name of STATION_EVENT_NAMES) {
      stationSocket.on(name, (payload) => got.push({ name, payload }));
      boardSocket.on(name, () => board.push(name));
    }
    expect(await stationSocket.emitWithAck('station:join', { stationId: station.id })).toEqual({ ok: true, room: `station:${station.id}` });
    expect(await boardSocket.emitWithAck('board:join', {})).toEqual({ ok: true, room: 'board' });
    // joining replays the station's last state
    await new Promise((r) => setTimeout(r, 50));
    expect(got[0]?.name).toBe('station:state');

    const serial = (await h.freshSerials('EOL-1', 1))[0];
    const before = Date.now();
    const r = await h.run(station.id, serial);
    expect(r.verdict).toBe('pass');
    // the final station:state follows run:finished
    await new Promise((r) => setTimeout(r, 200));
    const names = got.slice(1).map((e) => e.name);
    expect(names[0]).toBe('station:state');
    expect(names[1]).toBe('run:started');
    expect(names.at(-2)).toBe('run:finished');
    expect(names.at(-1)).toBe('station:state');
    const steps = got.filter((e) => e.name === 'step:started').map((e) => (e.payload as { stepIndex: number }).stepIndex);
    expect(steps).toEqual(steps.map((_, i) => i));
    // every measurement comes after its step started and before the next
    let currentStep = '';
    for (const e of got) {
      if (e.name === 'step:started') currentStep = (e.payload as { stepKey: string }).stepKey;
      if (e.name === 'measurement:judged') expect((e.payload as { stepKey: string }).stepKey).toBe(currentStep);
    }
    const testing = got[1].payload as StationEventMap['station:state'];
    expect(testing).toMatchObject({ state: 'testing', currentSerial: serial, currentRunId: r.runId });
    const started = got[2].payload as StationEventMap['run:started'];
    expect(started.run.serial).toBe(serial);
    expect(started.steps.length).toBe(steps.length);
    const judged = got.filter((e) => e.name === 'measurement:judged').map((e) => e.payload as StationEventMap['measurement:judged']);
    expect(judged[0].measurement).toMatchObject({ runId: r.runId, verdict: 'pass', unit: 'mA' });
    expect((got.at(-1)!.payload as StationEventMap['station:state']).state).toBe('ready');
    const stamps = got.slice(1).map((e) => e.payload.emittedAt);
    expect(stamps.every((s, i) => s >= before && (i === 0 || s >= stamps[i - 1]))).toBe(true);
    expect(got.every((e) => e.payload.stationId === station.id)).toBe(true);
    // the board saw the same run
    expect(board.filter((n) => n === 'run:finished')).toHaveLength(1);
    expect(board.filter((n) => n === 'measurement:judged').length).toBe(judged.length);
  });

  it('does not send one station’s events to a socket that joined another', async () => {
    const eol2 = await h.station('EOL-2');
    const eol1 = await h.station('EOL-1');
    const s = connect(h.token);
    expect((await outcome(s)).ok).toBe(true);
    await s.emitWithAck('station:join', { stationId: eol2.id });
    const seen: number[] = [];
    for (const name of STATION_EVENT_NAMES) s.on(name, (p) => seen.push(p.stationId));
    const serial = (await h.freshSerials('EOL-1', 1))[0];
    await h.run(eol1.id, serial);
    await new Promise((r) => setTimeout(r, 100));
    expect(seen.filter((id) => id === eol1.id)).toEqual([]);
  });
});
