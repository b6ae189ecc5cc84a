import { describe, expect, it } from 'vitest';
import { decodePng, pdfRgbImages, pdfText, readBarcode } from './pdf-inspect.spec-helper';
import {
  code128Png,
  failureDetail,
  formatLimits,
  formatReading,
  localDateTime,
  RepairTagData,
  RepairTagFailure,
  renderRepairTag,
  TAG_HEIGHT_PT,
  TAG_WIDTH_PT,
} from './repair-tag.pdf';

const failure = (over: Partial<RepairTagFailure> = {}): RepairTagFailure => ({
  stepName: 'Output at load',
  name: 'Output voltage at 1.5 A',
  value: 4.712,
  unit: 'V',
  lowLimit: 4.85,
  highLimit: 5.15,
  guardedLow: null,
  guardedHigh: null,
  verdict: 'fail',
  ...over,
});

const TAG: RepairTagData = {
  runId: 4711,
  serial: 'K5A-2648-00017',
  partNumber: 'OB-BK0503',
  lotCode: 'LB-2648-03',
  stationCode: 'EOL-1',
  fixtureCode: 'FX-101',
  operatorName: 'Line B operator',
  attempt: 1,
  finishedAt: new Date(2026, 11, 2, 14, 7, 30),
  failures: [
    failure(),
    failure({ stepName: 'Ripple', name: 'Output ripple', value: 31.5, unit: 'mV', lowLimit: null, highLimit: 50, guardedLow: null, guardedHigh: 48.2, verdict: 'guard_fail' }),
  ],
};

describe('formatting', () => {
  it('prints readings with three decimals below 10 and fewer above', () => {
    expect(formatReading(4.71249)).toBe('4.712');
    expect(formatReading(31.5)).toBe('31.50');
    expect(formatReading(912.34)).toBe('912.3');
    expect(formatReading(-0.0123)).toBe('-0.012');
  });

  it('prints two-sided and one-sided limits', () => {
    expect(formatLimits(4.85, 5.15, 'V')).toBe('4.850 … 5.150 V');
    expect(formatLimits(80, null, '%')).toBe('at least 80.00 %');
    expect(formatLimits(null, 35, 'mA')).toBe('at most 35.00 mA');
    expect(formatLimits(null, null, 'V')).toBe('no limit');
  });

  it('says why a measurement was rejected', () => {
    expect(failureDetail(failure())).toBe('4.712 V; spec 4.850 … 5.150 V; outside spec');
    expect(failureDetail(failure({ value: null }))).toBe('no reading; spec 4.850 … 5.150 V');
    expect(failureDetail(failure({ value: 4.852, verdict: 'guard_fail', guardedLow: 4.855, guardedHigh: 5.145 }))).toBe(
      '4.852 V; spec 4.850 … 5.150 V; inside spec, outside guard band (accept 4.855 … 5.145 V)',
    );
  });

  it('writes the finish time as local wall-clock time', () => {
    expect(localDateTime(new Date(2026, 0, 5, 6, 4, 59))).toBe('2026-01-05 06:04');
  });
});

describe('renderRepairTag', () => {
  it('makes a one-page 100 mm × 70 mm PDF', async () => {
    const pdf = await renderRepairTag(TAG);
    expect(pdf.subarray(0, 5).toString('latin1')).toBe('%PDF-');
    // 100 mm and 70 mm at 72 pt per inch (25.4 mm)
    expect(TAG_WIDTH_PT).toBeCloseTo(283.4646, 3);
    expect(TAG_HEIGHT_PT).toBeCloseTo(198.4252, 3);
    const boxes = pdf.toString('latin1').match(/\/MediaBox \[0 0 ([\d.]+) ([\d.]+)\]/g) ?? [];
    expect(boxes).toHaveLength(1);
    expect(boxes[0]).toMatch(/\[0 0 283\.46\d* 198\.42\d*\]/);
  });

  it('prints the heading, serial, where and how it was tested, and each failure with its limits', async () => {
    // compressed (the default) and uncompressed files carry the same text
    for (const compress of [true, false]) {
      // wrapped lines come out as separate text runs
      const text = pdfText(await renderRepairTag(TAG, { compress })).replace(/\s+/g, ' ');
      expect(text).toContain('SEND TO REPAIR');
      expect(text).toContain('K5A-2648-00017');
      for (const fact of ['OB-BK0503', 'LB-2648-03', 'EOL-1', 'FX-101', 'Line B operator', '2026-12-02 14:07', '4711']) expect(text).toContain(fact);
      expect(text).toContain('Output at load: Output voltage at 1.5 A');
      expect(text).toContain('4.712 V; spec 4.850 … 5.150 V; outside spec');
      expect(text).toContain('31.50 mV; spec at most 50.00 mV; inside spec, outside guard band (accept at most 48.20 mV)');
    }
  });

  it('embeds the serial as a Code 128 barcode identical to a fresh bwip-js rendering, and it reads back', async () => {
    const pdf = await renderRepairTag(TAG);
    const images = pdfRgbImages(pdf);
    expect(images).toHaveLength(1);
    const reference = decodePng(await code128Png(TAG.serial));
    expect(images[0].width).toBe(reference.width);
    expect(images[0].height).toBe(reference.height);
    expect(images[0].rgb.equals(reference.rgb)).toBe(true);
    const decoded = readBarcode(images[0]);
    expect(decoded.text).toBe('K5A-2648-00017');
  });

  it('continues on a second label when the failures do not fit, repeating the serial', async () => {
    const many = Array.from({ length: 9 }, (_, i) => failure({ name: `Output voltage at ${i / 2} A` }));
    const pdf = await renderRepairTag({ ...TAG, failures: many }, { compress: false });
    expect(pdf.toString('latin1').match(/\/Type \/Page\b/g)).toHaveLength(2);
    const text = pdfText(pdf);
    expect(text).toContain('SEND TO REPAIR (continued)');
    expect(text.split('K5A-2648-00017').length - 1).toBe(2);
    for (let i = 0; i < 9; i++) expect(text).toContain(`Output voltage at ${i / 2} A`);
  });

  it('shows characters the built-in fonts lack as "?" instead of wrong glyphs', async () => {
    const text = pdfText(await renderRepairTag({ ...TAG, operatorName: 'Lead Ω ≤ 2 ✓', failures: [] }, { compress: false }));
    expect(text).toContain('Lead Ohm <= 2 ?');
    expect(text).toContain('No failing measurement was stored');
  });

  it('cuts a fact too wide for its column with "…" instead of wrapping it over the next row', async () => {
    const runs = pdfText(await renderRepairTag({ ...TAG, operatorName: 'Second-shift operator of line B, module assembly' }, { compress: false })).split('\n');
    const shown = runs.find((r) => r.startsWith('Second-shift'));
    expect(shown).toMatch(/^Second-shift .*…$/);
    expect(runs.filter((r) => r.includes('module assembly'))).toEqual([]);
  });

  it('refuses a serial that cannot be barcoded', async () => {
    await expect(renderRepairTag({ ...TAG, serial: 'K5A\t001' })).rejects.toThrow(/cannot be printed as a barcode/);
  });
});
