import type { AddressInfo } from 'node:net';
import { io, Socket } from 'socket.io-client';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Fixture } from '../src/fixtures/fixture.entity';
import { Lot, LotState } from '../src/lots/lot.entity';
import { PlanVersion, PlanVersionState } from '../src/plans/plan-version.entity';
import type { StationEventName, StationStatePayload } from '../src/realtime/station-events';
import { createTestApp, login, TestApp } from './create-test-app';
import { EngineHarness } from './engine-helpers';

/**
 * Master-data changes reach the station screens and the board at once: after a fixture, station, lot or plan
 * change, every affected station gets a fresh `station:state`, computed as GET /api/stations/:id/status does.
 */
describe('station state announced on master-data changes', () => {
  let t: TestApp;
  let h: EngineHarness;
  let url: string;
  let engineer: string;
  let eol1: { id: number; fixtureId: number; lotId: number; lotCode: string };
  const sockets: Socket[] = [];
  /** Everything the EOL-1 room socket and the board socket received, in order */
  const room: { name: StationEventName; payload: { stationId: number } }[] = [];
  const board: { name: StationEventName; payload: { stationId: number } }[] = [];

  function connect(token: string): Socket {
    const s = io(url, { auth: { token }, transports: ['websocket'], reconnection: false, forceNew: true });
    sockets.push(s);
    return s;
  }

  function connected(s: Socket): Promise<void> {
    return new Promise((resolve, reject) => {
      if (s.connected) return resolve();
      s.once('connect', () => resolve());
      s.once('connect_error', reject);
    });
  }

  /** Resolves with the first `station:state` received from position `from` on that matches. */
  function stateEvent(
    log: typeof room,
    from: number,
    match: (p: StationStatePayload) => boolean,
    timeoutMs = 5_000,
  ): Promise<StationStatePayload> {
    const deadline = Date.now() + timeoutMs;
    return new Promise((resolve, reject) => {
      const look = () => {
        const hit = log.slice(from).find((e) => e.name === 'station:state' && match(e.payload as StationStatePayload));
        if (hit) return resolve(hit.payload as StationStatePayload);
        if (Date.now() > deadline) {
          const seen = log.slice(from).map((e) => `${e.name} ${JSON.stringify(e.payload)}`);
          return reject(new Error(`no matching station:state within ${timeoutMs} ms; received: ${seen.join(' | ') || 'nothing'}`));
        }
        setTimeout(look, 20);
      };
      look();
    });
  }

  async function statusOf(stationId: number) {
    return (await h.http().get(`/api/stations/${stationId}/status`).set('Authorization', `Bearer ${engineer}`).expect(200)).body;
  }

  function calibrate(body: { calibratedAt: string; dueAt: string }) {
    return h
      .http()
      .post(`/api/fixtures/${eol1.fixtureId}/calibrations`)
      .set('Authorization', `Bearer ${engineer}`)
      .send({ ...body, certificate: 'OBE-CAL-TEST-01', voltageUncertaintyV: 0.004, currentUncertaintyA: 0.003 });
  }

  const DAY_MS = 86_400_000;
  const goodCalibration = () => ({ calibratedAt: new Date(Date.now() - DAY_MS).toISOString(), dueAt: new Date(Date.now() + 365 * DAY_MS).toISOString() });
  // a certificate from a year that has run out: due 1 Mar 2025 (plain-date wording of the station screen)
  const lapsedCalibration = { calibratedAt: '2024-03-01T00:00:00.000Z', dueAt: '2025-03-01T00:00:00.000Z' };
  const OVERDUE_REASON = 'Calibration overdue since 1 Mar 2025';

  beforeAll(async () => {
    t = await createTestApp();
    await t.app.listen(0, '127.0.0.1');
    url = `http://127.0.0.1:${(t.app.getHttpServer().address() as AddressInfo).port}`;
    engineer = await login(t.app, 'engineer');
    h = new EngineHarness(t, await login(t.app, 'operator'));
    await h.simulate('FX-101', { defectRates: {} });
    const s = await h.station('EOL-1');
    eol1 = { id: s.id, fixtureId: s.fixture!.id, lotId: s.activeLot!.id, lotCode: s.activeLot!.code };

    const stationSocket = connect(h.token);
    const boardSocket = connect(await login(t.app, 'quality'));
    await Promise.all([connected(stationSocket), connected(boardSocket)]);
    for (const name of ['station:state', 'run:started', 'run:finished'] as StationEventName[]) {
      stationSocket.on(name, (payload) => room.push({ name, payload }));
      boardSocket.on(name, (payload) => board.push({ name, payload }));
    }
    expect(await stationSocket.emitWithAck('station:join', { stationId: eol1.id })).toEqual({ ok: true, room: `station:${eol1.id}` });
    expect(await boardSocket.emitWithAck('board:join', {})).toEqual({ ok: true, room: 'board' });
    // joining replays the current state: the seeded station is ready
    await stateEvent(room, 0, (p) => p.state === 'ready');
  });

  afterAll(async () => {
    for (const s of sockets) s.disconnect();
    await t?.close();
  });

  it('a calibration that has run out blocks the station with the reason; a current one makes it ready again', async () => {
    const from = room.length;
    const boardFrom = board.length;
    await calibrate(lapsedCalibration).expect(200);
    const blocked = await stateEvent(room, from, (p) => p.state === 'blocked');
    expect(blocked).toMatchObject({ stationId: eol1.id, state: 'blocked', reasons: [OVERDUE_REASON] });
    expect(typeof blocked.emittedAt).toBe('number');
    // the same state as the status route
    expect(await statusOf(eol1.id)).toMatchObject({ state: 'blocked', reasons: [OVERDUE_REASON] });
    // and the board sees it too
    await stateEvent(board, boardFrom, (p) => p.stationId === eol1.id && p.state === 'blocked');

    const fixedFrom = room.length;
    await calibrate(goodCalibration()).expect(200);
    const ready = await stateEvent(room, fixedFrom, () => true);
    expect(ready).toMatchObject({ stationId: eol1.id, state: 'ready', reasons: [] });
  });

  it('a refused calibration changes nothing and announces nothing', async () => {
    const from = room.length;
    // due before calibrated: refused with 400, so the stored fixture and the station stay as they were
    await calibrate({ calibratedAt: '2025-03-01T00:00:00.000Z', dueAt: '2024-03-01T00:00:00.000Z' }).expect(400);
    await new Promise((r) => setTimeout(r, 300));
    expect(room.slice(from).filter((e) => e.name === 'station:state')).toEqual([]);
  });

  it('taking the fixture out of service and back (PATCH) is announced', async () => {
    let from = room.length;
    await h.http().patch(`/api/fixtures/${eol1.fixtureId}`).set('Authorization', `Bearer ${engineer}`).send({ active: false }).expect(200);
    expect(await stateEvent(room, from, () => true)).toMatchObject({ state: 'blocked', reasons: ['Fixture FX-101 is out of service'] });
    from = room.length;
    await h.http().patch(`/api/fixtures/${eol1.fixtureId}`).set('Authorization', `Bearer ${engineer}`).send({ active: true }).expect(200);
    expect(await stateEvent(room, from, () => true)).toMatchObject({ state: 'ready', reasons: [] });
  });

  it('contacts worn to the limit block the station; replacing them is announced as ready', async () => {
    let from = room.length;
    // the count rises one per clamped unit during runs; set it at the allowance directly
    const em = t.orm.em.fork();
    const f = await em.findOneOrFail(Fixture, { id: eol1.fixtureId });
    f.contactCyclesUsed = f.contactCyclesAllowed;
    await em.flush();
    const worn = await stateEvent(room, from, () => true);
    expect(worn.state).toBe('blocked');
    expect(worn.reasons).toEqual([`Contact cycles at limit (${f.contactCyclesAllowed.toLocaleString('en-US')} of ${f.contactCyclesAllowed.toLocaleString('en-US')})`]);
    from = room.length;
    await h
      .http()
      .post(`/api/fixtures/${eol1.fixtureId}/contacts-replaced`)
      .set('Authorization', `Bearer ${engineer}`)
      .send({ reason: 'pogo pins and clamp pads replaced' })
      .expect(200);
    expect(await stateEvent(room, from, () => true)).toMatchObject({ state: 'ready', reasons: [] });
  });

  it('clearing and setting the active lot (station PATCH) is announced', async () => {
    let from = room.length;
    await h.http().patch(`/api/stations/${eol1.id}`).set('Authorization', `Bearer ${engineer}`).send({ activeLotId: null }).expect(200);
    expect(await stateEvent(room, from, () => true)).toMatchObject({ state: 'idle', reasons: ['No active lot'] });
    from = room.length;
    await h.http().patch(`/api/stations/${eol1.id}`).set('Authorization', `Bearer ${engineer}`).send({ activeLotId: eol1.lotId }).expect(200);
    expect(await stateEvent(room, from, () => true)).toMatchObject({ state: 'ready', reasons: [] });
  });

  it('a lot put on hold is announced once its transaction commits; a rolled-back change announces nothing', async () => {
    // no REST route changes a lot's state yet; the announcement comes from the write itself, whoever makes it
    let from = room.length;
    await t.orm.em.fork().transactional(async (em) => {
      const lot = await em.findOneOrFail(Lot, { id: eol1.lotId });
      lot.state = LotState.OnHold;
      lot.holdReason = 'solder paste lot under review';
      await em.flush();
      // flushed but not committed: nothing may be announced yet
      await new Promise((r) => setTimeout(r, 100));
      expect(room.slice(from).filter((e) => e.name === 'station:state')).toEqual([]);
    });
    expect(await stateEvent(room, from, () => true)).toMatchObject({
      state: 'blocked',
      reasons: [`Lot ${eol1.lotCode} is on hold: solder paste lot under review`],
    });

    from = room.length;
    await expect(
      t.orm.em.fork().transactional(async (em) => {
        const lot = await em.findOneOrFail(Lot, { id: eol1.lotId });
        lot.state = LotState.Closed;
        await em.flush();
        throw new Error('changed my mind');
      }),
    ).rejects.toThrow('changed my mind');
    await new Promise((r) => setTimeout(r, 300));
    expect(room.slice(from).filter((e) => e.name === 'station:state')).toEqual([]);

    const em = t.orm.em.fork();
    const lot = await em.findOneOrFail(Lot, { id: eol1.lotId });
    lot.state = LotState.Open;
    lot.holdReason = undefined;
    await em.flush();
    expect(await stateEvent(room, from, () => true)).toMatchObject({ state: 'ready', reasons: [] });
  });

  it('a change during a run keeps the station testing and is announced when the run ends', async () => {
    const [serial] = await h.freshSerials('EOL-1', 1);
    // realistic timing: tenths of a second per step, so the calibration lands while the unit is under test
    await h.simulate('FX-101', { defectRates: {}, serials: { [serial]: 'good' } }, 'realistic');
    let changed: Promise<unknown> | undefined;
    let changedAt = 0;
    const stop = h.engine.onStepStarting((runId, _key, stepIndex) => {
      if (stepIndex !== 1 || changed) return;
      changed = calibrate(lapsedCalibration)
        .expect(200)
        .then(async () => {
          changedAt = room.length;
          // give a wrong announcement time to arrive, then end the run early
          await new Promise((r) => setTimeout(r, 200));
          await h.http().post(`/api/runs/${runId}/abort`).set('Authorization', `Bearer ${h.token}`).expect(200);
        });
    });
    try {
      const from = room.length;
      const r = await h.run(eol1.id, serial);
      await changed;
      expect(r.verdict).toBe('aborted');
      const finishedAt = room.findIndex((e, i) => i >= from && e.name === 'run:finished');
      expect(finishedAt).toBeGreaterThanOrEqual(changedAt);
      // while the unit was under test, nothing but 'testing'
      const during = room.slice(from, finishedAt).filter((e) => e.name === 'station:state') as unknown as { payload: StationStatePayload }[];
      expect(during.map((e) => e.payload.state)).toEqual(['testing']);
      // after it, the calibration that lapsed during the run
      const after = await stateEvent(room, finishedAt, (p) => p.state === 'blocked');
      expect(after.reasons).toEqual([OVERDUE_REASON]);
      expect(room.filter((e) => e.name === 'station:state').at(-1)?.payload).toMatchObject({ state: 'blocked' });
    } finally {
      stop();
      await h.simulate('FX-101', { defectRates: {} }, 'instant');
    }
    const from = room.length;
    await calibrate(goodCalibration()).expect(200);
    await stateEvent(room, from, (p) => p.state === 'ready');
  });

  it('superseding the only released plan of a product blocks the station testing it', async () => {
    const eol3 = await h.station('EOL-3');
    const from = board.length;
    const em = t.orm.em.fork();
    const version = await em.findOneOrFail(PlanVersion, { state: PlanVersionState.Released, plan: { product: eol3.activeLot!.product.id } });
    version.state = PlanVersionState.Superseded;
    await em.flush();
    const blocked = await stateEvent(board, from, (p) => p.stationId === eol3.id);
    expect(blocked).toMatchObject({ state: 'blocked', reasons: ['No released plan for OB-BK1202'] });
    // EOL-1 tests another product: not announced
    expect(board.slice(from).filter((e) => e.name === 'station:state' && e.payload.stationId === eol1.id)).toEqual([]);
  });
});
