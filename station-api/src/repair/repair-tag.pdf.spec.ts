import { describe, expect, it } from 'vitest';
import { decodePng, pdfRgbImages, pdfText, readBarcode } from './pdf-inspect.spec-helper';
import { formatMeasured } from '../contract/value-format';
import {
  byStep,
  code128Png,
  failureDetail,
  localDateTime,
  moduleDots,
  RepairTagData,
  RepairTagFailure,
  renderRepairTag,
  type PrinterDpi,
  TAG_HEIGHT_PT,
  TAG_WIDTH_PT,
} from './repair-tag.pdf';

const failure = (over: Partial<RepairTagFailure> = {}): RepairTagFailure => ({
  stepName: 'Output at load',
  quantity: 'voutV@1.5',
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
  plan: { code: 'OB-BK0503-EOL', version: 3 },
  failures: [
    failure(),
    failure({ stepName: 'Ripple', quantity: 'rippleMvPp', name: 'Output ripple', value: 31.5, unit: 'mV', lowLimit: null, highLimit: 50, guardedLow: null, guardedHigh: 48.2, verdict: 'guard_fail' }),
  ],
};

describe('formatting', () => {
  it('writes figures with the formatter the screens use (one formatter for screen and tag)', () => {
    // issue 7/8: the tag printed 87.72 % where the screen printed 87.7 %
    const eff = failure({ stepName: 'Efficiency', quantity: 'efficiencyPct@1.5', name: 'Efficiency at 1.5 A', value: 87.72, unit: '%', lowLimit: 88, highLimit: null });
    expect(failureDetail(eff)).toBe('87.7 %; spec ≥ 88.0 %; outside spec');
    const screen = formatMeasured(eff);
    expect(failureDetail(eff)).toBe(`${screen.value} ${screen.unit}; spec ${screen.spec}; outside spec`);
  });

  it('says why a measurement was rejected', () => {
    expect(failureDetail(failure())).toBe('4.712 V; spec 4.850 … 5.150 V; outside spec');
    expect(failureDetail(failure({ value: null }))).toBe('no reading; spec 4.850 … 5.150 V');
    expect(failureDetail(failure({ value: 4.852, verdict: 'guard_fail', guardedLow: 4.855, guardedHigh: 5.145 }))).toBe(
      '4.852 V; spec 4.850 … 5.150 V; inside spec, outside guard band (accept 4.855 … 5.145 V)',
    );
  });

  it('names each step once, however many of its measurements failed', () => {
    const groups = byStep([
      failure(),
      failure({ quantity: 'regulationPct', name: 'Load regulation', value: 1.2, unit: '%', lowLimit: null, highLimit: 1 }),
      failure({ stepName: 'Ripple', quantity: 'rippleMvPp', name: 'Ripple', value: 60, unit: 'mV', lowLimit: null, highLimit: 50 }),
    ]);
    expect(groups).toEqual([
      { stepName: 'Output at load', lines: ['Output voltage at 1.5 A: 4.712 V; spec 4.850 … 5.150 V; outside spec', 'Load regulation: 1.20 %; spec ≤ 1.00 %; outside spec'] },
      { stepName: 'Ripple', lines: ['60.0 mV; spec ≤ 50.0 mV; outside spec'] },
    ]);
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
      expect(text).toContain('Output at load Output voltage at 1.5 A: 4.712 V; spec 4.850 … 5.150 V; outside spec');
      expect(text).toContain('Ripple Output ripple: 31.5 mV; spec <= 50.0 mV; inside spec, outside guard band (accept <= 48.2 mV)');
      // issue 8: the plan version is named, the run number printed once
      expect(text).toContain('Plan OB-BK0503-EOL v3');
      expect(text.split('4711').length - 1).toBe(1);
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

  it('does not repeat the step name on each line of a step with several failures', async () => {
    const many = [failure(), failure({ name: 'Output voltage at 3 A', quantity: 'voutV@3' })];
    const text = pdfText(await renderRepairTag({ ...TAG, failures: many }, { compress: false }));
    expect(text.split('Output at load').length - 1).toBe(1);
  });

  // Module widths as whole printer dots: 203 dpi = 8 dots/mm (0.125 mm a dot), 300 dpi = 0.0847 mm a dot
  // (printer resolutions as sold; arithmetic). 72 PDF points make an inch (PDF 1.7, ISO 32000-1 §8.3.2.3).
  describe('barcode in whole printer dots', () => {
    const dots = (pt: number, dpi: number) => (pt * dpi) / 72;
    const isWhole = (x: number) => Math.abs(x - Math.round(x)) < 1e-6;

    it('chooses the whole number of dots nearest 0.33 mm, shrinking for long serials but never under 0.25 mm', () => {
      const room = 94 * (72 / 25.4);
      expect(moduleDots(203, 130, room).dots).toBe(3); // 0.375 mm
      expect(moduleDots(300, 130, room).dots).toBe(4); // 0.339 mm
      // 240 + 20 quiet modules × 0.375 mm = 97.5 mm > 94 mm: 2 dots (0.250 mm); at 300 dpi 4 dots (88.0 mm) fit
      expect(moduleDots(203, 240, room).dots).toBe(2);
      expect(moduleDots(300, 240, room).dots).toBe(4);
      // 280 + 20 modules × 0.339 mm = 101.6 mm > 94 mm: 3 dots (0.254 mm)
      expect(moduleDots(300, 280, room).dots).toBe(3);
      for (const dpi of [203, 300] as PrinterDpi[]) {
        for (const modules of [60, 130, 230, 400]) {
          const m = moduleDots(dpi, modules, room);
          expect(isWhole(dots(m.modulePt, dpi))).toBe(true);
          expect((m.modulePt * 25.4) / 72).toBeGreaterThanOrEqual(0.25);
        }
      }
    });

    it('places the symbol on whole dots at 203 and at 300 dpi, and it still reads back', async () => {
      for (const dpi of [203, 300] as PrinterDpi[]) {
        const pdf = await renderRepairTag(TAG, { compress: false, dpi });
        // pdfkit draws an image as "w 0 0 -h x y cm /I.. Do"
        const m = /([\d.]+) 0 0 -?([\d.]+) ([\d.]+) ([\d.]+) cm\s*\/I\d+ Do/.exec(pdf.toString('latin1'));
        expect(m).not.toBeNull();
        const [width, , x] = [Number(m![1]), Number(m![2]), Number(m![3])];
        const image = pdfRgbImages(pdf)[0];
        const modules = image.width / 2;
        expect(isWhole(dots(width / modules, dpi))).toBe(true);
        expect(Math.abs(dots(x, dpi) - Math.round(dots(x, dpi)))).toBeLessThan(0.01);
        expect(readBarcode(image).text).toBe(TAG.serial);
      }
    });
  });

  it('refuses a serial that cannot be barcoded', async () => {
    await expect(renderRepairTag({ ...TAG, serial: 'K5A\t001' })).rejects.toThrow(/cannot be printed as a barcode/);
  });
});
