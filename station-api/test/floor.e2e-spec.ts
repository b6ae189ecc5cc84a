import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { FixtureSimulation } from '../src/simulation/fixture-simulation';
import { code128Png } from '../src/repair/repair-tag.pdf';
import { decodePng, pdfRgbImages, pdfText, readBarcode } from '../src/repair/pdf-inspect.spec-helper';
import type { MeasurementView, StationEventMap, StationEventName } from '../src/realtime/station-events';
import { StationEventsPublisher } from '../src/realtime/station-events.publisher';
import { RunEngineService } from '../src/runs/run-engine.service';
import { TestRun } from '../src/runs/test-run.entity';
import { Station } from '../src/stations/station.entity';
import type { BoardEntryDto } from '../src/board/dto/board.dto';
import { Unit, UnitState } from '../src/units/unit.entity';
import { createTestApp, login, TestApp } from './create-test-app';

const ROLES = ['operator', 'engineer', 'quality', 'admin'] as const;
type RoleName = (typeof ROLES)[number];

/** HH:MM, local time, 12 hours from now: one 24-hour shift that started 12 h ago, so no boundary falls inside the test. */
function shiftStartTwelveHoursAway(): string {
  const d = new Date(Date.now() + 12 * 3_600_000);
  return `${String(d.getHours()).padStart(2, '0')}:${String(d.getMinutes()).padStart(2, '0')}`;
}

/** Reads a binary body (the PDF) as a Buffer. */
function binary(res: request.Response, cb: (err: Error | null, body: Buffer) => void): void {
  const chunks: Buffer[] = [];
  res.on('data', (c: Buffer) => chunks.push(c));
  res.on('end', () => cb(null, Buffer.concat(chunks)));
}

/**
 * The shop-floor routes against the real engine: EOL-1 tests one good unit and one with a wrong feedback
 * divider (simulated fixture, instant timing), then the shift counters, board, repair tag and repair queue
 * are checked against what happened.
 */
describe('floor: shift counters, board, repair tag, repair queue', () => {
  let t: TestApp;
  const tokens = {} as Record<RoleName, string>;
  const http = () => request(t.app.getHttpServer());
  const as = <T extends request.Test>(role: RoleName, r: T): T => r.set('Authorization', `Bearer ${tokens[role]}`);
  const stations: Record<string, { id: number; activeLotId: number }> = {};
  let serials: string[];
  let passRunId: number;
  let failRunId: number;
  let passSerial: string;
  let failSerial: string;
  let shiftStarts: string;

  /** Scan, start and poll GET /api/runs/:id until the run has finished, as an operator screen would. */
  async function testUnit(stationId: number, serial: string): Promise<{ id: number; verdict: string }> {
    await as('operator', http().post(`/api/stations/${stationId}/scan`)).send({ serial }).expect(200);
    const started = await as('operator', http().post(`/api/stations/${stationId}/runs`)).send({ serial, safetyConfirmed: true });
    expect(started.status, JSON.stringify(started.body)).toBe(201);
    const id = started.body.run.id as number;
    for (const deadline = Date.now() + 20_000; Date.now() < deadline; ) {
      const run = (await as('operator', http().get(`/api/runs/${id}`)).expect(200)).body;
      if (run.verdict !== 'running') return { id, verdict: run.verdict };
      await new Promise((r) => setTimeout(r, 20));
    }
    throw new Error(`run ${id} did not finish within 20 s`);
  }

  beforeAll(async () => {
    shiftStarts = shiftStartTwelveHoursAway();
    t = await createTestApp({ SHIFT_STARTS: shiftStarts });
    for (const role of ROLES) tokens[role] = await login(t.app, role);
    const em = t.orm.em.fork();
    for (const s of await em.find(Station, {}, { populate: ['activeLot'] })) stations[s.code] = { id: s.id, activeLotId: s.activeLot!.id };
    serials = (
      await em.find(Unit, { lot: stations['EOL-1'].activeLotId, state: UnitState.Untested }, { orderBy: { serial: 'asc' }, limit: 3 })
    ).map((u) => u.serial);
    [passSerial, failSerial] = serials;
    // the same way the engine tests choose a defect: per serial, everything else good
    await t.app.get(FixtureSimulation).reconfigure('FX-101', { defectRates: {}, serials: { [failSerial]: 'wrong_feedback' } });

    const pass = await testUnit(stations['EOL-1'].id, passSerial);
    const fail = await testUnit(stations['EOL-1'].id, failSerial);
    expect([pass.verdict, fail.verdict]).toEqual(['pass', 'fail']);
    passRunId = pass.id;
    failRunId = fail.id;
  });
  afterAll(async () => t?.close());

  describe('GET /api/stations/:id/shift-summary', () => {
    it('counts one pass and one fail in the current shift', async () => {
      const before = Date.now();
      const res = await as('operator', http().get(`/api/stations/${stations['EOL-1'].id}/shift-summary`)).expect(200);
      const s = res.body;
      expect(s).toMatchObject({
        stationId: stations['EOL-1'].id,
        shiftName: `Shift 1 (${shiftStarts}–${shiftStarts})`,
        tested: 2,
        passed: 1,
        failed: 1,
        errors: 0,
        aborted: 0,
        // both units were tested for the first time here; one passed: 1/2
        firstPassYieldPct: 50,
      });
      const start = Date.parse(s.shiftStart);
      expect(Date.parse(s.shiftEnd) - start).toBe(24 * 3_600_000);
      expect(start).toBeLessThan(before);
      // the shift is hours old: units per hour = the 2 units finished in the last hour (not 2 ÷ hours)
      expect(before - start).toBeGreaterThan(3_600_000);
      expect(s.unitsPerHour).toBe(2);
    });

    it('gives zeros and nulls for a station that tested nothing', async () => {
      const res = await as('quality', http().get(`/api/stations/${stations['EOL-2'].id}/shift-summary`)).expect(200);
      expect(res.body).toMatchObject({ tested: 0, passed: 0, failed: 0, errors: 0, aborted: 0, firstPassYieldPct: null, unitsPerHour: null });
    });

    it('refuses an unknown station with 404 and a bad id with 400, each with a sentence', async () => {
      const missing = await as('operator', http().get('/api/stations/9999/shift-summary')).expect(404);
      expect(missing.body).toMatchObject({ statusCode: 404, message: 'There is no station with id 9999.', details: { code: 'unknown_station' } });
      const bad = await as('operator', http().get('/api/stations/EOL-1/shift-summary')).expect(400);
      expect(bad.body.message).toBe('The station id in the address must be a whole number, e.g. 1.');
    });

    it('is open to every signed-in role and to nobody else', async () => {
      for (const role of ROLES) await as(role, http().get(`/api/stations/${stations['EOL-1'].id}/shift-summary`)).expect(200);
      await http().get(`/api/stations/${stations['EOL-1'].id}/shift-summary`).expect(401);
    });
  });

  describe('GET /api/board', () => {
    it('lists the three stations with state, fixture, lot, last runs and shift counters', async () => {
      const board = (await as('quality', http().get('/api/board')).expect(200)).body as BoardEntryDto[];
      expect(board.map((b) => b.station.code)).toEqual(['EOL-1', 'EOL-2', 'EOL-3']);
      expect(board.map((b) => b.fixture?.code)).toEqual(['FX-101', 'FX-102', 'FX-103']);
      expect(board.map((b) => b.activeLot?.partNumber)).toEqual(['OB-BK0503', 'OB-BK3305', 'OB-BK1202']);
      for (const b of board) {
        expect(['idle', 'ready', 'testing', 'fault', 'blocked']).toContain(b.state);
        expect(Array.isArray(b.reasons)).toBe(true);
        expect(Number.isNaN(Date.parse(b.fixture!.calibrationDueAt))).toBe(false);
        expect(b.currentRun).toBeNull();
      }
      const eol1 = board[0];
      expect(eol1.station).toEqual({ id: stations['EOL-1'].id, code: 'EOL-1', name: 'End-of-line 1' });
      // newest first
      expect(eol1.lastRuns.map((r: { id: number }) => r.id)).toEqual([failRunId, passRunId]);
      expect(eol1.lastRuns[0]).toMatchObject({ serial: failSerial, verdict: 'fail', failedStepKey: expect.any(String) });
      expect(eol1.lastRuns[1]).toMatchObject({ serial: passSerial, verdict: 'pass', failedStepKey: null });
      expect(eol1.shift).toMatchObject({ tested: 2, passed: 1, failed: 1, firstPassYieldPct: 50 });
      expect(board[1].lastRuns).toEqual([]);
    });

    it('shows the same state and reasons as the station status route', async () => {
      const board = (await as('operator', http().get('/api/board')).expect(200)).body as BoardEntryDto[];
      for (const b of board) {
        const status = (await as('operator', http().get(`/api/stations/${b.station.id}/status`)).expect(200)).body;
        expect({ state: b.state, reasons: b.reasons }).toEqual({ state: status.state, reasons: status.reasons });
      }
    });

    // issue 8 "board as a wall screen": "Last units" showed week-old results with no time
    it("lists only this shift's finished runs, each with its finish time", async () => {
      const em = t.orm.em.fork();
      const pass = await em.findOneOrFail(TestRun, { id: passRunId });
      const finishedAt = pass.finishedAt!;
      const board = async () => ((await as('operator', http().get('/api/board')).expect(200)).body as BoardEntryDto[])[0];
      const now = await board();
      for (const r of now.lastRuns) expect(Date.parse(r.finishedAt)).toBeGreaterThanOrEqual(Date.parse(now.shift.shiftStart));
      expect(now.lastRuns.find((r: { id: number }) => r.id === passRunId)!.finishedAt).toBe(finishedAt.toISOString());
      // the same run as if it had finished a minute before this shift began: no longer on the board
      const earlier = new Date(Date.parse(now.shift.shiftStart) - 60_000);
      await em.nativeUpdate(TestRun, { id: passRunId }, { finishedAt: earlier, startedAt: new Date(earlier.getTime() - 5_000) });
      try {
        expect((await board()).lastRuns.map((r: { id: number }) => r.id)).toEqual([failRunId]);
      } finally {
        await em.nativeUpdate(TestRun, { id: passRunId }, { finishedAt, startedAt: pass.startedAt });
      }
    });

    it('is open to every signed-in role and to nobody else', async () => {
      for (const role of ROLES) await as(role, http().get('/api/board')).expect(200);
      await http().get('/api/board').expect(401);
    });
  });

  describe('GET /api/runs/:id/repair-tag.pdf', () => {
    it('prints a PDF tag for the failed run with the serial as text and as a Code 128 barcode', async () => {
      const detail = (await as('operator', http().get(`/api/runs/${failRunId}`)).expect(200)).body;
      const res = await as('operator', http().get(`/api/runs/${failRunId}/repair-tag.pdf`)).buffer(true).parse(binary).expect(200);
      expect(res.headers['content-type']).toMatch(/^application\/pdf/);
      expect(res.headers['content-disposition']).toContain(`repair-tag-${failSerial}-run${failRunId}.pdf`);
      const pdf = res.body as Buffer;
      expect(pdf.subarray(0, 4).toString('latin1')).toBe('%PDF');

      const text = pdfText(pdf).replace(/\s+/g, ' ');
      for (const expected of ['SEND TO REPAIR', failSerial, 'OB-BK0503', detail.lotCode, 'EOL-1', 'FX-101', 'Line B operator', String(failRunId)]) {
        expect(text).toContain(expected);
      }
      const failing = (detail.measurements as MeasurementView[]).filter((m) => m.verdict !== 'pass');
      expect(failing.length).toBeGreaterThan(0);
      for (const m of failing) {
        expect(text).toContain(m.name);
        expect(text).toContain(m.stepName);
      }
      expect(text).toContain('outside spec');

      // the embedded image is exactly what bwip-js draws for the serial, and it reads back as the serial
      const [image] = pdfRgbImages(pdf);
      const reference = decodePng(await code128Png(failSerial));
      expect(image.rgb.equals(reference.rgb)).toBe(true);
      expect(readBarcode(image).text).toBe(failSerial);
    });

    it('changes nothing stored', async () => {
      const before = (await as('engineer', http().get(`/api/runs/${failRunId}`)).expect(200)).body;
      await as('engineer', http().get(`/api/runs/${failRunId}/repair-tag.pdf`)).expect(200);
      const after = (await as('engineer', http().get(`/api/runs/${failRunId}`)).expect(200)).body;
      expect(after).toEqual(before);
    });

    it('refuses a passed run with 409, an unknown run with 404 and a bad id with 400', async () => {
      const passed = await as('operator', http().get(`/api/runs/${passRunId}/repair-tag.pdf`)).expect(409);
      expect(passed.headers['content-type']).toMatch(/json/);
      expect(passed.body).toMatchObject({ statusCode: 409, message: 'This unit passed; no repair tag is needed.', details: { code: 'run_passed' } });
      const missing = await as('operator', http().get('/api/runs/999999/repair-tag.pdf')).expect(404);
      expect(missing.body).toMatchObject({ message: 'There is no run with id 999999.', details: { code: 'run_not_found' } });
      const bad = await as('operator', http().get('/api/runs/latest/repair-tag.pdf')).expect(400);
      expect(bad.body.message).toBe('The run id in the address must be a whole number, e.g. 1.');
    });

    it('lays the barcode out for a 203 or 300 dpi label printer and refuses any other resolution', async () => {
      for (const dpi of [203, 300]) {
        const res = await as('operator', http().get(`/api/runs/${failRunId}/repair-tag.pdf?dpi=${dpi}`)).buffer(true).parse(binary).expect(200);
        expect(readBarcode(pdfRgbImages(res.body as Buffer)[0]).text).toBe(failSerial);
      }
      const bad = await as('operator', http().get(`/api/runs/${failRunId}/repair-tag.pdf?dpi=600`)).expect(400);
      expect(JSON.stringify(bad.body)).toContain("dpi must be 203 or 300 (the label printer's resolution)");
    });

    it('is open to operator, engineer, quality and admin, and to nobody signed out', async () => {
      for (const role of ROLES) await as(role, http().get(`/api/runs/${failRunId}/repair-tag.pdf`)).expect(200);
      await http().get(`/api/runs/${failRunId}/repair-tag.pdf`).expect(401);
    });
  });

  describe('GET /api/repair-queue', () => {
    it('holds the failed unit once the operator sends it, with its failing run and first failing measurement, not the passed one', async () => {
      const detail = (await as('engineer', http().get(`/api/runs/${failRunId}`)).expect(200)).body;
      // one failure with attempts left: not on the queue until the operator sends it (retest policy, issue 8)
      const before = (await as('engineer', http().get('/api/repair-queue')).expect(200)).body;
      expect(before.items.map((i: { serial: string }) => i.serial)).not.toContain(failSerial);
      await as('operator', http().post(`/api/units/${failSerial}/send-to-repair`).send({})).expect(200);
      const q = (await as('engineer', http().get('/api/repair-queue')).expect(200)).body;
      expect(q.total).toBe(q.items.length);
      const serialsInQueue = q.items.map((i: { serial: string }) => i.serial);
      expect(serialsInQueue).toContain(failSerial);
      expect(serialsInQueue).not.toContain(passSerial);
      const item = q.items.find((i: { serial: string }) => i.serial === failSerial);
      const first = (detail.measurements as MeasurementView[]).find((m) => m.verdict !== 'pass')!;
      expect(item).toMatchObject({
        state: 'failed',
        reason: 'sent_by_operator',
        testCount: 1,
        lot: { id: stations['EOL-1'].activeLotId, code: detail.lotCode, partNumber: 'OB-BK0503' },
        lastFailingRun: {
          id: failRunId,
          station: { id: stations['EOL-1'].id, code: 'EOL-1' },
          attempt: 1,
          failedStepKey: detail.failedStepKey,
          finishedAt: detail.finishedAt,
          firstFailure: { stepKey: first.stepKey, quantity: first.quantity, value: first.value, unit: first.unit, lowLimit: first.lowLimit, highLimit: first.highLimit, verdict: first.verdict },
        },
      });
    });

    it('filters by lot and by the station of the last failing run', async () => {
      const inQueue = async (query: string) =>
        ((await as('operator', http().get(`/api/repair-queue${query}`)).expect(200)).body.items as { serial: string }[]).map((i) => i.serial);
      expect(await inQueue(`?stationId=${stations['EOL-1'].id}`)).toContain(failSerial);
      expect(await inQueue(`?stationId=${stations['EOL-2'].id}`)).not.toContain(failSerial);
      expect(await inQueue(`?lotId=${stations['EOL-1'].activeLotId}`)).toContain(failSerial);
      expect(await inQueue(`?lotId=${stations['EOL-2'].activeLotId}`)).not.toContain(failSerial);
    });

    it('refuses unknown and malformed filters with a message naming the field', async () => {
      const missing = await as('operator', http().get('/api/repair-queue?lotId=99999')).expect(404);
      expect(missing.body).toMatchObject({ message: 'There is no lot with id 99999.', details: { code: 'unknown_lot' } });
      const bad = await as('operator', http().get('/api/repair-queue?lotId=LB-1')).expect(400);
      expect(bad.body.details).toEqual(expect.arrayContaining([expect.objectContaining({ field: 'lotId' })]));
      expect(bad.body.message).toContain('lotId must be a whole number');
      const unknownField = await as('operator', http().get('/api/repair-queue?serial=x')).expect(400);
      expect(unknownField.body.message).toContain('serial');
    });

    it('is open to operator, engineer, quality and admin, and to nobody signed out', async () => {
      for (const role of ROLES) await as(role, http().get('/api/repair-queue')).expect(200);
      await http().get('/api/repair-queue').expect(401);
    });
  });

  it('documents the four routes in the OpenAPI document', async () => {
    const doc = (await http().get('/api/docs/openapi.json').expect(200)).body;
    expect(Object.keys(doc.paths)).toEqual(
      expect.arrayContaining(['/api/stations/{id}/shift-summary', '/api/board', '/api/runs/{id}/repair-tag.pdf', '/api/repair-queue']),
    );
    expect(Object.keys(doc.paths['/api/runs/{id}/repair-tag.pdf'].get.responses['200'].content)).toEqual(['application/pdf']);
    expect(doc.components.schemas.ShiftSummaryDto.required).toEqual(expect.arrayContaining(['firstPassYieldPct', 'unitsPerHour']));
  });

  describe('while a run is going', () => {
    it('shows the run and its current step on the board, and refuses its repair tag with 409', async () => {
      const serial = serials[2];
      const handle = await t.app.get(FixtureSimulation).reconfigure('FX-101', { defectRates: {} });
      // hold the fixture's replies once step 2 has started, look at the board, then let the run go on
      // (released well inside the 2 s command timeout)
      let release!: () => void;
      const gate = new Promise<void>((resolve) => (release = resolve));
      let holding = false;
      const sim = handle.simulator;
      const answer = sim.handleLine.bind(sim);
      sim.handleLine = (line: string) => (holding ? gate.then(() => answer(line)) : answer(line));
      const publisher = t.app.get(StationEventsPublisher);
      let reachedStep2!: () => void;
      const atStep2 = new Promise<void>((resolve) => (reachedStep2 = resolve));
      // hold as soon as step 2 begins (synchronous hook: with instant timing the run would otherwise finish
      // before the step:started event, which waits for the earlier writes), then wait for that event
      const engine = t.app.get(RunEngineService);
      const stopHold = engine.onStepStarting((_runId, _key, stepIndex) => {
        if (stepIndex === 2) holding = true;
      });
      const stopEvents = publisher.subscribe(<K extends StationEventName>(name: K, payload: StationEventMap[K]) => {
        if (name === 'step:started' && (payload as StationEventMap['step:started']).stepIndex === 2) reachedStep2();
      });
      const stop = () => {
        stopHold();
        stopEvents();
      };
      try {
        const started = await as('operator', http().post(`/api/stations/${stations['EOL-1'].id}/runs`)).send({ serial, safetyConfirmed: true }).expect(201);
        const runId = started.body.run.id as number;
        await atStep2;
        const board = (await as('operator', http().get('/api/board')).expect(200)).body as BoardEntryDto[];
        const detail = (await as('operator', http().get(`/api/runs/${runId}`)).expect(200)).body;
        expect(board[0].state).toBe('testing');
        expect(board[0].currentRun).toEqual({
          id: runId,
          serial,
          stepIndex: 2,
          stepCount: detail.steps.length,
          stepName: detail.steps[2].name,
          startedAt: detail.startedAt,
        });
        const refused = await as('operator', http().get(`/api/runs/${runId}/repair-tag.pdf`)).expect(409);
        expect(refused.body.message).toMatch(/^The run is still going/);
        expect(refused.body.details.code).toBe('run_in_progress');
        release();
        for (const deadline = Date.now() + 20_000; Date.now() < deadline; ) {
          if ((await as('operator', http().get(`/api/runs/${runId}`))).body.verdict !== 'running') break;
          await new Promise((r) => setTimeout(r, 20));
        }
        const after = (await as('operator', http().get('/api/board')).expect(200)).body as BoardEntryDto[];
        expect(after[0].currentRun).toBeNull();
        expect(after[0].lastRuns[0].id).toBe(runId);
      } finally {
        release();
        stop();
      }
    });
  });
});
