import bwipjs from 'bwip-js';
import PDFDocument from 'pdfkit';
import type { MeasuredAgainstLimits } from '../runs/run-views';
import { isCode128TagText } from './code128';

/** One measurement that did not pass, as the tag prints it. Values and limits are in `unit`. */
export interface RepairTagFailure extends MeasuredAgainstLimits {
  stepName: string;
  /** Name of the judged quantity, e.g. "Output voltage at 1.5 A" */
  name: string;
  verdict: 'fail' | 'guard_fail';
}

/** Everything printed on a repair tag. */
export interface RepairTagData {
  runId: number;
  serial: string;
  partNumber: string;
  lotCode: string;
  stationCode: string;
  fixtureCode: string;
  operatorName: string;
  attempt: number;
  finishedAt: Date;
  failures: RepairTagFailure[];
}

export interface RepairTagOptions {
  /** Deflate the page content (default true). Tests turn it off to read the text directly. */
  compress?: boolean;
}

const MM = 72 / 25.4;
/** Label stock: 100 mm × 70 mm, landscape */
export const TAG_WIDTH_PT = 100 * MM;
export const TAG_HEIGHT_PT = 70 * MM;
const MARGIN = 3 * MM;
/** Narrow-bar width X. 0.33 mm reads on any handheld scanner (common practice, no source); 0.25 mm is the least we go to. */
const MODULE_MM = 0.33;
const MIN_MODULE_MM = 0.25;
/** Quiet zone each side of a Code 128 symbol: 10 X (ISO/IEC 15417, from memory). */
const QUIET_MODULES = 10;
const BAR_HEIGHT_PT = 10 * MM;

/** Pixels per module in the PNG; the PDF scales the image to the module width above. */
export const BARCODE_PX_PER_MODULE = 2;

/**
 * The bwip-js options of the tag's barcode; exported so a test can render the same image and compare.
 * White background so the bars read the same with or without the image's alpha channel.
 */
export function barcodeOptions(serial: string) {
  return {
    bcid: 'code128',
    text: serial,
    scale: BARCODE_PX_PER_MODULE,
    height: 8,
    includetext: false,
    backgroundcolor: 'FFFFFF',
  } as const;
}

/** The serial as a Code 128 PNG (bwip-js picks code sets B/C for the shortest symbol). */
export function code128Png(serial: string): Promise<Buffer> {
  return bwipjs.toBuffer(barcodeOptions(serial));
}

/** Width of a PNG in pixels, from its IHDR chunk (PNG spec: width is the first field after the signature and chunk header). */
function pngWidthPx(png: Buffer): number {
  return png.readUInt32BE(16);
}

/** Characters the built-in PDF fonts (WinAnsi) can show; anything else prints as "?" rather than a wrong glyph. */
function printable(text: string): string {
  return text
    .replace(/≤/g, '<=')
    .replace(/≥/g, '>=')
    .replace(/Ω/g, 'Ohm')
    .replace(/[^\x20-\x7e\xa0-\xff‘’“”–—…•€™]/g, '?');
}

/** The text, cut and ended with "…" if it is wider than `widthPt` in the current font (pdfkit would wrap it). */
function fitWidth(doc: PDFKit.PDFDocument, text: string, widthPt: number): string {
  if (doc.widthOfString(text) <= widthPt) return text;
  let cut = text;
  while (cut.length > 1 && doc.widthOfString(`${cut}…`) > widthPt) cut = cut.slice(0, -1);
  return `${cut.trimEnd()}…`;
}

/** Three significant decimals in the instrument range we test (0.001 V … 999.9 mA), no exponent. */
export function formatReading(value: number): string {
  const a = Math.abs(value);
  if (a >= 1000) return value.toFixed(0);
  if (a >= 100) return value.toFixed(1);
  if (a >= 10) return value.toFixed(2);
  return value.toFixed(3);
}

function withUnit(value: number, unit: string): string {
  return unit ? `${formatReading(value)} ${unit}` : formatReading(value);
}

/** "4.850 … 5.150 V", "at least 80.0 %", "at most 35.0 mA" */
export function formatLimits(low: number | null, high: number | null, unit: string): string {
  const u = unit ? ` ${unit}` : '';
  if (low !== null && high !== null) return `${formatReading(low)} … ${formatReading(high)}${u}`;
  if (low !== null) return `at least ${formatReading(low)}${u}`;
  if (high !== null) return `at most ${formatReading(high)}${u}`;
  return 'no limit';
}

/** The second line of a failure: what was read, the spec, and why it was rejected. */
export function failureDetail(f: RepairTagFailure): string {
  const reading = f.value === null ? 'no reading' : withUnit(f.value, f.unit);
  const spec = `spec ${formatLimits(f.lowLimit, f.highLimit, f.unit)}`;
  if (f.verdict === 'guard_fail') {
    const guard = f.guardedLow !== null || f.guardedHigh !== null ? ` (accept ${formatLimits(f.guardedLow, f.guardedHigh, f.unit)})` : '';
    return `${reading}; ${spec}; inside spec, outside guard band${guard}`;
  }
  return f.value === null ? `${reading}; ${spec}` : `${reading}; ${spec}; outside spec`;
}

/** "2026-12-02 14:07" in the server's local time, which is the plant's wall clock */
export function localDateTime(d: Date): string {
  const p = (n: number) => String(n).padStart(2, '0');
  return `${d.getFullYear()}-${p(d.getMonth() + 1)}-${p(d.getDate())} ${p(d.getHours())}:${p(d.getMinutes())}`;
}

/**
 * Renders the repair tag: a 100 mm × 70 mm label that travels with a failed unit to the repair bench.
 * Heading, the serial as a Code 128 barcode and in text, where and how it was tested, and every
 * measurement that did not pass. Failures that do not fit continue on further labels of the same size.
 * @throws RangeError when the serial cannot be barcoded (see {@link isCode128TagText})
 */
export async function renderRepairTag(tag: RepairTagData, options: RepairTagOptions = {}): Promise<Buffer> {
  if (!isCode128TagText(tag.serial)) {
    throw new RangeError(`Serial ${JSON.stringify(tag.serial)} cannot be printed as a barcode (printable ASCII, 1–40 characters)`);
  }
  const png = await code128Png(tag.serial);
  const modules = pngWidthPx(png) / BARCODE_PX_PER_MODULE;

  const doc = new PDFDocument({
    size: [TAG_WIDTH_PT, TAG_HEIGHT_PT],
    margin: MARGIN,
    compress: options.compress ?? true,
    autoFirstPage: true,
    info: { Title: `Repair tag ${tag.serial}`, Subject: `Run ${tag.runId}`, Creator: 'Railwright' },
  });
  const chunks: Buffer[] = [];
  doc.on('data', (c: Buffer) => chunks.push(c));
  const finished = new Promise<Buffer>((resolve, reject) => {
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
  });

  const inner = TAG_WIDTH_PT - 2 * MARGIN;
  const bottom = TAG_HEIGHT_PT - MARGIN;

  const heading = (continued: boolean): number => {
    doc.font('Helvetica-Bold').fontSize(14).fillColor('black');
    doc.text(continued ? 'SEND TO REPAIR (continued)' : 'SEND TO REPAIR', MARGIN, MARGIN, { width: inner, lineBreak: false });
    doc.font('Helvetica').fontSize(7);
    doc.text(`Run ${tag.runId}`, MARGIN, MARGIN + 4, { width: inner, align: 'right', lineBreak: false });
    const y = MARGIN + 18;
    doc.moveTo(MARGIN, y).lineTo(MARGIN + inner, y).lineWidth(0.8).stroke();
    return y + 4;
  };

  let y = heading(false);

  // barcode: module width X, shrunk (not below 0.25 mm) only if a long serial would not fit with its quiet zones
  const fitMm = inner / (modules + 2 * QUIET_MODULES) / MM;
  const moduleMm = Math.max(Math.min(MODULE_MM, fitMm), Math.min(MIN_MODULE_MM, fitMm));
  const x = moduleMm * MM;
  doc.image(png, MARGIN + QUIET_MODULES * x, y, { width: modules * x, height: BAR_HEIGHT_PT });
  y += BAR_HEIGHT_PT + 2;
  doc.font('Courier-Bold').fontSize(11).text(tag.serial, MARGIN + QUIET_MODULES * x, y, { lineBreak: false });
  y += 14;

  const facts: [string, string][][] = [
    [
      ['Part', tag.partNumber],
      ['Lot', tag.lotCode],
      ['Station', tag.stationCode],
      ['Fixture', tag.fixtureCode],
    ],
    [
      ['Operator', tag.operatorName],
      ['Finished', localDateTime(tag.finishedAt)],
      ['Attempt', String(tag.attempt)],
      ['Run', String(tag.runId)],
    ],
  ];
  const col = inner / 4;
  for (const row of facts) {
    row.forEach(([label, value], i) => {
      doc.font('Helvetica').fontSize(5.5).fillColor('#444444').text(label.toUpperCase(), MARGIN + i * col, y, { width: col - 3, lineBreak: false });
      doc.font('Helvetica-Bold').fontSize(7.5).fillColor('black');
      doc.text(fitWidth(doc, printable(value), col - 3), MARGIN + i * col, y + 6.5, { lineBreak: false });
    });
    y += 17;
  }
  doc.moveTo(MARGIN, y).lineTo(MARGIN + inner, y).lineWidth(0.5).stroke();
  y += 3;
  doc.font('Helvetica-Bold').fontSize(7).text(tag.failures.length === 1 ? 'What failed' : `What failed (${tag.failures.length})`, MARGIN, y, { lineBreak: false });
  y += 9;

  if (tag.failures.length === 0) {
    doc.font('Helvetica').fontSize(6.5).text('No failing measurement was stored; see the run record.', MARGIN, y, { width: inner });
  }
  for (const f of tag.failures) {
    const title = printable(f.stepName === f.name ? f.name : `${f.stepName}: ${f.name}`);
    const detail = printable(failureDetail(f));
    doc.font('Helvetica-Bold').fontSize(6.5);
    const titleH = doc.heightOfString(title, { width: inner });
    doc.font('Helvetica').fontSize(6.5);
    const detailH = doc.heightOfString(detail, { width: inner - 6 });
    if (y + titleH + detailH > bottom) {
      doc.addPage();
      y = heading(true);
      doc.font('Courier-Bold').fontSize(9).text(tag.serial, MARGIN, y, { lineBreak: false });
      y += 12;
    }
    doc.font('Helvetica-Bold').fontSize(6.5).text(title, MARGIN, y, { width: inner });
    y += titleH;
    doc.font('Helvetica').fontSize(6.5).text(detail, MARGIN + 6, y, { width: inner - 6 });
    y += detailH + 2;
  }

  doc.end();
  return finished;
}
