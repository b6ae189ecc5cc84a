import { MikroORM } from '@mikro-orm/core';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { MeasurementView } from '../src/realtime/station-events';
import { createTestApp, login, TestApp } from './create-test-app';
import { EngineHarness } from './engine-helpers';

const DAY_MS = 86_400_000;
/** The smallest well-formed PDF header a file can start with (ISO 32000-1:2008 §7.5.2) and a little body */
const PDF = Buffer.from('%PDF-1.4\n1 0 obj << /Type /Catalog >> endobj\ntrailer << /Root 1 0 R >>\n%%EOF\n', 'latin1');

/**
 * Fixtures and calibration (issue 10): calibration records with their certificate PDFs, the current record's
 * uncertainties feeding the guard bands of the next run, warnings before blocking, and the contact reset.
 * EOL-1 runs OB-BK0503 on FX-101; EOL-2 has FX-102.
 */
describe('fixtures and calibration', () => {
  let t: TestApp;
  let h: EngineHarness;
  let engineer: string;
  let operator: string;
  let quality: string;
  let fx: Record<string, { id: number }>;
  let eol1: number;

  const http = () => h.http();
  const as = (token: string, req: ReturnType<ReturnType<typeof http>['get']>) => req.set('Authorization', `Bearer ${token}`);
  const sql = <T = Record<string, unknown>>(q: string, params: unknown[] = []) => t.orm.em.getConnection().execute<T[]>(q, params);
  const calibration = (over: Record<string, unknown> = {}) => ({
    calibratedAt: new Date(Date.now() - DAY_MS).toISOString(),
    dueAt: new Date(Date.now() + 365 * DAY_MS).toISOString(),
    certificate: 'OBE-CAL-26-2001',
    voltageUncertaintyV: 0.004,
    currentUncertaintyA: 0.003,
    ...over,
  });
  /** POST a calibration as multipart with the given file (all fields are text in a form) */
  function upload(fixtureId: number, fields: Record<string, unknown>, file?: { content: Buffer; filename: string; contentType: string }, token = engineer) {
    let req = as(token, http().post(`/api/fixtures/${fixtureId}/calibrations`));
    for (const [k, v] of Object.entries(fields)) req = req.field(k, typeof v === 'object' ? JSON.stringify(v) : String(v));
    if (file) req = req.attach('certificatePdf', file.content, { filename: file.filename, contentType: file.contentType });
    return req;
  }

  beforeAll(async () => {
    t = await createTestApp();
    operator = await login(t.app, 'operator');
    engineer = await login(t.app, 'engineer');
    quality = await login(t.app, 'quality');
    h = new EngineHarness(t, operator);
    const list = (await as(engineer, http().get('/api/fixtures')).expect(200)).body as { id: number; code: string }[];
    fx = Object.fromEntries(list.map((f) => [f.code, f]));
    eol1 = (await h.station('EOL-1')).id;
  });
  afterAll(async () => t?.close());

  it('lists the demo records, current first, with uncertainties per quantity and who recorded them', async () => {
    const res = await as(engineer, http().get(`/api/fixtures/${fx['FX-101'].id}/calibrations`)).expect(200);
    expect(res.body).toHaveLength(2);
    expect(res.body[0]).toMatchObject({ current: true, certificateNumber: 'OBE-CAL-26-0311', recordedBy: 'Test engineer', voltageUncertaintyV: 0.004 });
    expect(res.body[0].uncertainties).toEqual([
      { quantity: 'voutV', name: 'Output voltage', unit: 'V', uncertainty: 0.01 },
      { quantity: 'rippleMvPp', name: 'Output ripple and noise, peak-to-peak', unit: 'mV', uncertainty: 1 },
    ]);
    expect(res.body[1].current).toBe(false);
    const quantities = await as(operator, http().get('/api/fixtures/calibration-quantities')).expect(200);
    expect(quantities.body.map((q: { key: string }) => q.key)).toEqual(expect.arrayContaining(['voutV', 'iinNoLoadMa', 'rippleMvPp', 'undershootMv', 'efficiencyPct']));
    expect(quantities.body.map((q: { key: string }) => q.key)).not.toContain('foldback');
  });

  it('records a calibration with its certificate PDF and serves the file back with its type and name', async () => {
    const id = fx['FX-102'].id;
    const res = await upload(id, calibration({ uncertainties: { voutV: 0.006, rippleMvPp: 1.5 } }), { content: PDF, filename: 'FX-102 cert 2026.pdf', contentType: 'application/pdf' }).expect(200);
    expect(res.body).toMatchObject({ calibrationCertificate: 'OBE-CAL-26-2001', voltageUncertaintyV: 0.004, currentUncertaintyA: 0.003, status: 'in_service' });
    const records = (await as(quality, http().get(`/api/fixtures/${id}/calibrations`)).expect(200)).body;
    expect(records).toHaveLength(3);
    expect(records[0]).toMatchObject({
      id: res.body.currentCalibrationId,
      current: true,
      recordedBy: 'Test engineer',
      certificateFile: { fileName: 'FX-102 cert 2026.pdf', sizeBytes: PDF.length },
      uncertainties: [expect.objectContaining({ quantity: 'voutV', uncertainty: 0.006 }), expect.objectContaining({ quantity: 'rippleMvPp', uncertainty: 1.5 })],
    });
    const file = await as(engineer, http().get(records[0].certificateFile.href))
      .buffer(true)
      .parse((r, cb) => {
        const chunks: Buffer[] = [];
        r.on('data', (c: Buffer) => chunks.push(c));
        r.on('end', () => cb(null, Buffer.concat(chunks)));
      })
      .expect(200);
    expect(file.headers['content-type']).toBe('application/pdf');
    expect(file.headers['content-disposition']).toBe(`attachment; filename="FX-102 cert 2026.pdf"; filename*=UTF-8''FX-102%20cert%202026.pdf`);
    expect(Buffer.compare(file.body as Buffer, PDF)).toBe(0);
    // a record without a file, and one that does not exist, answer 404 with a reason
    const noFile = (await as(engineer, http().get(`/api/fixtures/${id}/calibrations`))).body.find((r: { certificateFile: unknown }) => r.certificateFile === null);
    expect((await as(engineer, http().get(`/api/fixtures/${id}/calibrations/${noFile.id}/certificate`)).expect(404)).body.message).toMatch(/no certificate PDF/);
    await as(engineer, http().get(`/api/fixtures/${fx['FX-101'].id}/calibrations/${records[0].id}/certificate`)).expect(404);
    const audit = await as(quality, http().get('/api/audit')).query({ entityType: 'fixture', entityId: String(id), action: 'fixture.calibrated' }).expect(200);
    expect(audit.body.items[0]).toMatchObject({ reason: 'certificate OBE-CAL-26-2001', after: { calibration: { id: records[0].id, certificateNumber: 'OBE-CAL-26-2001' } } });
  });

  it('refuses a file that is not a PDF, is too big or is sent as another type, with a clear message, and stores nothing', async () => {
    const id = fx['FX-103'].id;
    const count = async () => (await sql<{ n: number }>('select count(*) as n from calibration_records where fixture_id = ?', [id]))[0].n;
    const before = await count();
    const fixtureBefore = (await as(engineer, http().get(`/api/fixtures/${id}`))).body;

    const notPdf = await upload(id, calibration(), { content: Buffer.from('just some text, renamed'), filename: 'cert.pdf', contentType: 'application/pdf' }).expect(400);
    expect(notPdf.body.message).toMatch(/"cert\.pdf" is not a PDF \(it does not start with %PDF-\).*Nothing was stored/);
    const wrongType = await upload(id, calibration(), { content: PDF, filename: 'cert.png', contentType: 'image/png' }).expect(415);
    expect(wrongType.body.message).toMatch(/must be a PDF file \(application\/pdf\); "cert\.png" was sent as image\/png/);
    const big = Buffer.concat([PDF, Buffer.alloc(5 * 1024 * 1024)]);
    const tooBig = await upload(id, calibration(), { content: big, filename: 'scan.pdf', contentType: 'application/pdf' }).expect(413);
    expect(tooBig.body.message).toMatch(/larger than 5 MB/);
    const empty = await upload(id, calibration(), { content: Buffer.alloc(0), filename: 'empty.pdf', contentType: 'application/pdf' });
    expect(empty.status).toBe(400);
    const badQuantity = await as(engineer, http().post(`/api/fixtures/${id}/calibrations`)).send(calibration({ uncertainties: { voutV: 0.01, loadVoltsX: 1, rippleMvPp: -2 } })).expect(400);
    expect(badQuantity.body.message).toMatch(/"loadVoltsX" is not a measured quantity/);
    expect(badQuantity.body.message).toMatch(/uncertainties\.rippleMvPp must be a number above 0 \(in mV\)/);
    const badNumber = await upload(id, calibration({ voltageUncertaintyV: 'four mV' }), { content: PDF, filename: 'c.pdf', contentType: 'application/pdf' }).expect(400);
    expect(badNumber.body.details).toContainEqual(expect.objectContaining({ field: 'voltageUncertaintyV' }));
    const wrongField = await as(engineer, http().post(`/api/fixtures/${id}/calibrations`))
      .field('certificate', 'X')
      .attach('file', PDF, { filename: 'c.pdf', contentType: 'application/pdf' })
      .expect(400);
    expect(wrongField.body.message).toMatch(/form field "certificatePdf"/);

    expect(await count()).toBe(before);
    expect((await as(engineer, http().get(`/api/fixtures/${id}`))).body).toMatchObject({
      calibrationCertificate: fixtureBefore.calibrationCertificate,
      calibrationDueAt: fixtureBefore.calibrationDueAt,
      voltageUncertaintyV: fixtureBefore.voltageUncertaintyV,
    });
  });

  it('judges the next run with the new calibration: guard bands follow its uncertainty, and the run records it', async () => {
    const [first, second] = await h.freshSerials('EOL-1', 2);
    await h.simulate('FX-101', { defectRates: {} });
    const r1 = await h.run(eol1, first);
    const vout1 = (await h.detail(r1.runId)).measurements.find((m: MeasurementView) => m.quantity === 'voutV');
    // the seeded certificate states U = 0.01 V for the output voltage
    expect(vout1).toMatchObject({ lowLimit: 4.875, highLimit: 5.125, uncertainty: 0.01 });

    const recal = await as(engineer, http().post(`/api/fixtures/${fx['FX-101'].id}/calibrations`))
      .send(calibration({ certificate: 'OBE-CAL-26-2002', uncertainties: { voutV: 0.02 } }))
      .expect(200);
    const r2 = await h.run(eol1, second);
    const vout2 = (await h.detail(r2.runId)).measurements.find((m: MeasurementView) => m.quantity === 'voutV');
    // ILAC-G8:09/2019 §4.2.2 (binary statement with guard band w = U): acceptance limits TL − U and TL + U;
    // JCGM 106:2012 §8, guarded acceptance (clause number from memory, unverified): 4.875 + 0.02 = 4.895 V and
    // 5.125 − 0.02 = 5.105 V
    expect(vout2).toMatchObject({ lowLimit: 4.875, highLimit: 5.125, uncertainty: 0.02 });
    expect(vout2.guardedLow).toBeCloseTo(4.895, 12);
    expect(vout2.guardedHigh).toBeCloseTo(5.105, 12);
    // a quantity the new certificate does not state keeps the plan's value (ripple: 1 mV in EOL-BK0503)
    expect((await h.detail(r2.runId)).measurements.find((m: MeasurementView) => m.quantity === 'rippleMvPp')).toMatchObject({ uncertainty: 1 });

    const rows = await sql<{ id: number; calibration_id: number | null }>('select id, calibration_id from test_runs where id in (?, ?) order by id', [r1.runId, r2.runId]);
    const seededCurrent = (await sql<{ id: number }>("select id from calibration_records where certificate_number = 'OBE-CAL-26-0311'"))[0].id;
    expect(rows).toEqual([
      { id: r1.runId, calibration_id: seededCurrent },
      { id: r2.runId, calibration_id: recal.body.currentCalibrationId },
    ]);
  });

  it('warns within the warning window (station, board, fixtures page) without blocking', async () => {
    // FX-103 is seeded due in 20 days: inside the default 30-day window
    const fixtures = (await as(engineer, http().get('/api/fixtures')).expect(200)).body;
    const fx103 = fixtures.find((f: { code: string }) => f.code === 'FX-103');
    expect(fx103).toMatchObject({ status: 'due_soon', blocking: [], station: { code: 'EOL-3' } });
    expect(fx103.warnings).toEqual([expect.stringMatching(/^Calibration due \d{1,2} \w{3} \d{4} \(in (19|20) days\); book the recalibration$/)]);
    const eol3 = (await h.station('EOL-3')).id;
    const status = (await as(operator, http().get(`/api/stations/${eol3}/status`)).expect(200)).body;
    expect(status).toMatchObject({ state: 'ready', reasons: [] });
    expect(status.warnings).toEqual(fx103.warnings);
    const board = (await as(engineer, http().get('/api/board')).expect(200)).body;
    expect(board.find((e: { station: { code: string } }) => e.station.code === 'EOL-3').warnings).toEqual(fx103.warnings);

    // contact cycles at 90 % warn too, and the unit can still be tested
    await h.setFixture('FX-102', { contactCyclesUsed: 45_500 });
    const eol2 = (await h.station('EOL-2')).id;
    const worn = (await as(operator, http().get(`/api/stations/${eol2}/status`))).body;
    expect(worn).toMatchObject({ state: 'ready', warnings: ['Contact cycles at 91 % (45,500 of 50,000); plan a probe change'] });
    expect((await as(engineer, http().get(`/api/fixtures/${fx['FX-102'].id}`))).body).toMatchObject({ status: 'contacts_low' });
    const [serial] = await h.freshSerials('EOL-2', 1);
    await h.simulate('FX-102', { defectRates: {} });
    expect((await h.run(eol2, serial)).verdict).toBe('pass');
  });

  it('blocks testing when the calibration is overdue or the contacts are exhausted, telling the operator why', async () => {
    await h.setFixture('FX-102', { calibrationDueAt: new Date('2025-03-01T00:00:00Z') });
    const eol2 = (await h.station('EOL-2')).id;
    const status = (await as(operator, http().get(`/api/stations/${eol2}/status`))).body;
    expect(status).toMatchObject({ state: 'blocked', reasons: ['Calibration overdue since 1 Mar 2025'] });
    const [serial] = await h.freshSerials('EOL-2', 1);
    const refused = await as(operator, http().post(`/api/stations/${eol2}/runs`)).send({ serial, safetyConfirmed: true }).expect(409);
    expect(refused.body.message).toBe('Station EOL-2 cannot test now: Calibration overdue since 1 Mar 2025.');
    expect((await as(engineer, http().get(`/api/fixtures/${fx['FX-102'].id}`))).body).toMatchObject({ status: 'overdue', blocking: ['Calibration overdue since 1 Mar 2025'] });

    await h.setFixture('FX-102', { calibrationDueAt: new Date(Date.now() + 300 * DAY_MS), contactCyclesUsed: 50_000 });
    const exhausted = await as(operator, http().post(`/api/stations/${eol2}/runs`)).send({ serial, safetyConfirmed: true }).expect(409);
    expect(exhausted.body.message).toBe('Station EOL-2 cannot test now: Contact cycles at limit (50,000 of 50,000).');
    expect((await as(engineer, http().get(`/api/fixtures/${fx['FX-102'].id}`))).body).toMatchObject({ status: 'contacts_exhausted' });
  });

  it('resets the contact count only with a reason, audited with the count before and after', async () => {
    const id = fx['FX-102'].id;
    for (const body of [{}, { reason: '' }, { reason: '    ' }]) {
      const res = await as(engineer, http().post(`/api/fixtures/${id}/contacts-replaced`)).send(body).expect(400);
      expect(res.body.message).toMatch(/reason/);
    }
    expect((await as(engineer, http().get(`/api/fixtures/${id}`))).body.contactCyclesUsed).toBe(50_000);
    const res = await as(engineer, http().post(`/api/fixtures/${id}/contacts-replaced`)).send({ reason: 'Pogo pins replaced after wear marks' }).expect(200);
    expect(res.body).toMatchObject({ contactCyclesUsed: 0, status: 'in_service', warnings: [] });
    const audit = await as(quality, http().get('/api/audit')).query({ action: 'fixture.contacts_replaced', entityId: String(id) }).expect(200);
    expect(audit.body.items[0]).toMatchObject({ actorName: 'engineer', reason: 'Pogo pins replaced after wear marks', before: { contactCyclesUsed: 50_000 }, after: { contactCyclesUsed: 0 } });
  });

  it('refuses operators every calibration write, the records and the certificates (403); quality reads', async () => {
    const id = fx['FX-101'].id;
    await upload(id, calibration(), { content: PDF, filename: 'c.pdf', contentType: 'application/pdf' }, operator).expect(403);
    await as(operator, http().post(`/api/fixtures/${id}/calibrations`)).send(calibration()).expect(403);
    await as(quality, http().post(`/api/fixtures/${id}/calibrations`)).send(calibration()).expect(403);
    await as(operator, http().post(`/api/fixtures/${id}/contacts-replaced`)).send({ reason: 'probe change' }).expect(403);
    await as(operator, http().get(`/api/fixtures/${id}/calibrations`)).expect(403);
    const records = (await as(quality, http().get(`/api/fixtures/${fx['FX-102'].id}/calibrations`)).expect(200)).body;
    await as(operator, http().get(records[0].certificateFile.href)).expect(403);
    await as(quality, http().get(records[0].certificateFile.href)).expect(200);
  });
});

describe('upgrade: each fixture keeps its calibration as a first record', () => {
  const dir = mkdtempSync(join(tmpdir(), 'railwright-calibration-upgrade-'));
  afterAll(() => rmSync(dir, { recursive: true, force: true }));

  it('turns the fixture columns into a record stating no per-quantity uncertainty (guard bands unchanged)', async () => {
    process.env.LOG_LEVEL = 'error';
    const { createOrmConfig } = await import('../src/mikro-orm.config');
    const orm = await MikroORM.init(createOrmConfig(join(dir, 'old.sqlite'), { debug: false }));
    try {
      const migrator = orm.getMigrator();
      await migrator.up({ to: 'Migration20261202141000' });
      const sql = (q: string, params: unknown[] = []) => orm.em.getConnection().execute(q, params);
      const t = Date.parse('2026-06-01T08:00:00Z');
      await sql(
        `insert into fixtures (id, created_at, updated_at, code, name, port_path, calibrated_at, calibration_due_at, calibration_certificate, voltage_uncertainty_v, current_uncertainty_a) values (7, ?, ?, 'FX-7', 'Old fixture', 'mock:FX-7', ?, ?, 'LAB-0042', 0.003, 0.002)`,
        [t, t, t - 30 * DAY_MS, t + 335 * DAY_MS],
      );
      await sql(`insert into fixtures (id, created_at, updated_at, code, name, port_path, calibration_due_at) values (8, ?, ?, 'FX-8', 'Never dated', 'mock:FX-8', ?)`, [t, t, t + DAY_MS]);
      await migrator.up();
      const rows = await sql(
        'select fixture_id, calibrated_at, due_at, recorded_by_id, certificate_number, voltage_uncertainty_v, current_uncertainty_a, uncertainties, certificate_pdf from calibration_records order by fixture_id',
      );
      expect(rows).toEqual([
        { fixture_id: 7, calibrated_at: t - 30 * DAY_MS, due_at: t + 335 * DAY_MS, recorded_by_id: null, certificate_number: 'LAB-0042', voltage_uncertainty_v: 0.003, current_uncertainty_a: 0.002, uncertainties: '{}', certificate_pdf: null },
        { fixture_id: 8, calibrated_at: null, due_at: t + DAY_MS, recorded_by_id: null, certificate_number: null, voltage_uncertainty_v: 0.005, current_uncertainty_a: 0.005, uncertainties: '{}', certificate_pdf: null },
      ]);
      expect(await sql('select count(*) as n from fixtures')).toEqual([{ n: 2 }]);
    } finally {
      await orm.close(true);
    }
  });
});
