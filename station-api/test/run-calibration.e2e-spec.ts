import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestApp, login, TestApp } from './create-test-app';
import { EngineHarness } from './engine-helpers';

const DAY_MS = 86_400_000;
/** The smallest well-formed PDF header a file can start with (ISO 32000-1:2008 §7.5.2) and a little body */
const PDF = Buffer.from('%PDF-1.4\n1 0 obj << /Type /Catalog >> endobj\ntrailer << /Root 1 0 R >>\n%%EOF\n', 'latin1');

/**
 * One run's answer (GET /api/runs/:id) names the calibration record the run was judged with (issue 10): a run
 * after a recalibration names the new record, an older run keeps its own, and a run from before calibration
 * records were kept says null. EOL-1 runs OB-BK0503 on FX-101 (seeded record OBE-CAL-26-0311).
 */
describe('run detail: the calibration the run used', () => {
  let t: TestApp;
  let h: EngineHarness;
  let engineer: string;
  let quality: string;
  let eol1: number;
  let fx101: number;

  const sql = <T = Record<string, unknown>>(q: string, params: unknown[] = []) => t.orm.em.getConnection().execute<T[]>(q, params);

  beforeAll(async () => {
    t = await createTestApp();
    h = new EngineHarness(t, await login(t.app, 'operator'));
    engineer = await login(t.app, 'engineer');
    quality = await login(t.app, 'quality');
    const station = await h.station('EOL-1');
    eol1 = station.id;
    fx101 = station.fixture!.id;
    await h.simulate('FX-101', { defectRates: {} });
  });
  afterAll(async () => t?.close());

  it('names the new record for a run after a recalibration; the older run keeps the record it used', async () => {
    const [before, after] = await h.freshSerials('EOL-1', 2);
    const r1 = await h.run(eol1, before);
    const old = (await h.detail(r1.runId)).calibration;
    expect(old).toMatchObject({
      fixtureId: fx101,
      certificateNumber: 'OBE-CAL-26-0311',
      recordedBy: 'Test engineer',
      current: true,
      uncertainties: [
        { quantity: 'voutV', name: 'Output voltage', unit: 'V', uncertainty: 0.01 },
        { quantity: 'rippleMvPp', name: 'Output ripple and noise, peak-to-peak', unit: 'mV', uncertainty: 1 },
      ],
    });
    expect(old.calibratedAt).toEqual(expect.any(String));
    expect(old.dueAt).toEqual(expect.any(String));

    const calibratedAt = new Date(Date.now() - DAY_MS).toISOString();
    const dueAt = new Date(Date.now() + 365 * DAY_MS).toISOString();
    const recal = await h
      .http()
      .post(`/api/fixtures/${fx101}/calibrations`)
      .set('Authorization', `Bearer ${engineer}`)
      .field('calibratedAt', calibratedAt)
      .field('dueAt', dueAt)
      .field('certificate', 'OBE-CAL-26-3001')
      .field('voltageUncertaintyV', '0.004')
      .field('currentUncertaintyA', '0.003')
      .field('uncertainties', JSON.stringify({ voutV: 0.02 }))
      .attach('certificatePdf', PDF, { filename: 'FX-101 recal.pdf', contentType: 'application/pdf' })
      .expect(200);
    const newId = recal.body.currentCalibrationId as number;

    const r2 = await h.run(eol1, after);
    const detail = await h.detail(r2.runId);
    expect(detail.calibration).toEqual({
      id: newId,
      fixtureId: fx101,
      calibratedAt,
      dueAt,
      recordedAt: expect.any(String),
      recordedBy: 'Test engineer',
      certificateNumber: 'OBE-CAL-26-3001',
      voltageUncertaintyV: 0.004,
      currentUncertaintyA: 0.003,
      uncertainties: [{ quantity: 'voutV', name: 'Output voltage', unit: 'V', uncertainty: 0.02 }],
      certificateFile: { fileName: expect.stringMatching(/\.pdf$/), sizeBytes: PDF.length, href: `/api/fixtures/${fx101}/calibrations/${newId}/certificate` },
      current: true,
    });
    // the stated U is the one the run's guard bands used
    expect(detail.measurements.find((m: { quantity: string }) => m.quantity === 'voutV')).toMatchObject({ uncertainty: 0.02 });

    // the older run still names its own record, now no longer in force
    const again = (await h.detail(r1.runId)).calibration;
    expect(again).toMatchObject({ id: old.id, certificateNumber: 'OBE-CAL-26-0311', current: false });

    // the link the answer gives downloads the certificate (quality reads run details and certificates)
    const pdf = await h.http().get(detail.calibration.certificateFile.href).set('Authorization', `Bearer ${quality}`).expect(200);
    expect(pdf.headers['content-type']).toContain('application/pdf');
  });

  it('answers null for a run from before calibration records were kept', async () => {
    const [serial] = await h.freshSerials('EOL-1', 1);
    const r = await h.run(eol1, serial);
    // runs stored before Migration20261202151000 have no calibration_id; made so here by hand
    await sql('update test_runs set calibration_id = null where id = ?', [r.runId]);
    const detail = await h.detail(r.runId);
    expect(detail.calibration).toBeNull();
    // the rest of the answer is unchanged
    expect(detail).toMatchObject({ id: r.runId, fixtureCode: 'FX-101', serial });
  });
});
