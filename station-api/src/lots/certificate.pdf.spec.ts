import { describe, expect, it } from 'vitest';
import { pdfText } from '../repair/pdf-inspect.spec-helper';
import { wilsonInterval } from '../stats';
import type { CertificateContent } from './certificate-content';
import { percentWithInterval, renderCertificate, statisticsCells } from './certificate.pdf';

const AT = new Date(2026, 11, 2, 14, 7, 0);

const content = (over: Partial<CertificateContent> = {}): CertificateContent => ({
  certificateNo: 'COC-LB-2649-07',
  lot: { code: 'LB-2649-07', createdAt: new Date(2026, 10, 30, 8, 0), plannedQuantity: 40 },
  product: { partNumber: 'OB-BK0503', name: 'Buck 12 V to 5 V, 3 A' },
  quantities: { registered: 40, passed: 38, scrapped: 2 },
  planVersions: [{ planCode: 'OB-BK0503-EOL', planName: 'End of line', version: 3, checksum: 'a'.repeat(64), runs: 44 }],
  fixtures: [{ code: 'FX-101', name: 'Buck fixture A', runs: 44, calibrationDueAtTest: new Date(2027, 2, 1, 12), calibrationDueNow: new Date(2027, 2, 1, 12) }],
  yield: {
    unitsTested: 40,
    firstPass: wilsonInterval(36, 40),
    final: wilsonInterval(38, 40),
    definitions: { firstPass: 'units whose first judged run passed ÷ units tested', final: 'units that passed in the end ÷ units tested', interval: '95 % Wilson score interval' },
  },
  statistics: [
    { stepName: 'Output at load', name: 'Output voltage at 1.5 A', quantity: 'voutV@1.5', unit: 'V', n: 38, mean: 5.0012, sd: 0.0123, min: 4.971, max: 5.033, lowLimit: 4.85, highLimit: 5.15, cpk: 3.84, cpkNote: null },
    { stepName: 'Ripple', name: 'Ripple', quantity: 'rippleMvPp', unit: 'mV', n: 38, mean: 21.4, sd: 1.9, min: 18.2, max: 26.1, lowLimit: null, highLimit: 50, cpk: 5.12, cpkNote: null },
  ],
  statisticsBasis: 'Values of the conforming units.',
  release: { by: 'Quinn Quality', at: AT, comment: 'Customer order 4471' },
  ...over,
});

describe('percentWithInterval', () => {
  it('writes the figure and its Wilson interval in percent with one decimal', () => {
    // Wilson (JASA 22, 1927) for 3/5 at 95 %: 0.2307 … 0.8824, computed by hand in test/yield.e2e-spec.ts
    expect(percentWithInterval(wilsonInterval(3, 5))).toBe('3 of 5 = 60.0 %   (95 % interval 23.1 % – 88.2 %)');
    expect(percentWithInterval(wilsonInterval(0, 0))).toBe('no unit tested');
  });
});

describe('statisticsCells', () => {
  it('writes values with the screens’ formatter and σ one digit finer', () => {
    expect(statisticsCells(content().statistics[0])).toEqual(['Output at load: Output voltage at 1.5 A', 'V', '38', '5.001', '0.0123', '4.971', '5.033', '4.850 … 5.150', '3.84']);
    expect(statisticsCells(content().statistics[1]).slice(7)).toEqual(['≤ 50.0', '5.12']);
  });
});

describe('renderCertificate', () => {
  it('prints every required fact, and the text reads back from the file', async () => {
    const pdf = await renderCertificate(content(), { compress: false });
    expect(pdf.subarray(0, 5).toString('latin1')).toBe('%PDF-');
    const text = pdfText(pdf);
    for (const s of [
      'Certificate of conformance',
      'LB-2649-07',
      'OB-BK0503',
      'OB-BK0503-EOL',
      'v3',
      'a'.repeat(64),
      'FX-101',
      '2027-03-01',
      '36 of 40 = 90.0 %',
      '38 of 40 = 95.0 %',
      'Method: 95 % Wilson score interval',
      'Output at load: Output voltage at 1.5 A',
      '0.0123',
      '3.84',
      '<= 50.0',
      'Quinn Quality',
      '2026-12-02 14:07',
      'Comment: Customer order 4471',
      'page 1 of 1',
    ]) {
      expect(text, s).toContain(s);
    }
  });

  it('is the same document when rendered twice from the same content (dates in the file are the release date)', async () => {
    const a = await renderCertificate(content());
    const b = await renderCertificate(content());
    // pdfkit writes a random file ID; everything else must agree
    const strip = (p: Buffer) => p.toString('latin1').replace(/\/ID \[<[0-9a-f]+> <[0-9a-f]+>\]/, '');
    expect(strip(a)).toBe(strip(b));
  });

  it('continues a long table on further pages with page numbers', async () => {
    const many = Array.from({ length: 70 }, (_, i) => ({ ...content().statistics[0], name: `Quantity ${i + 1}`, quantity: `q${i}V` }));
    const text = pdfText(await renderCertificate(content({ statistics: many }), { compress: false }));
    expect(text).toContain('Quantity 70');
    expect(text).toMatch(/page 2 of [23]/);
  });
});

describe('renderCertificate layout', () => {
  it('cuts a fact that would run into the next column and ends it with "…"', async () => {
    const long = content({ lot: { code: 'LB-2649-07-WITH-A-VERY-LONG-SUFFIX', createdAt: new Date(2026, 10, 30), plannedQuantity: 40 } });
    const text = pdfText(await renderCertificate(long, { compress: false }));
    // the lot fact is cut; the full code still appears in the footer and the statement
    expect(text).toMatch(/^LB-2649-07-WITH-A-VERY-\S*…$/m);
    expect(text).toContain('lot LB-2649-07-WITH-A-VERY-LONG-SUFFIX');
    expect(text).toContain('Buck 12 V to 5 V, 3 A');
  });
});
