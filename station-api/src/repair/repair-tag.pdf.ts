import bwipjs from 'bwip-js';
import PDFDocument from 'pdfkit';
import { formatMeasured } from '../contract/value-format';
import type { MeasuredAgainstLimits } from '../runs/run-views';
import { isCode128TagText } from './code128';

/** One measurement that did not pass, as the tag prints it. Values and limits are in `unit`. */
export interface RepairTagFailure extends MeasuredAgainstLimits {
  stepName: string;
  /** The judged quantity's key (e.g. `voutV@1.5`): decides the digits, as on the screen */
  quantity: string;
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
  /** The plan version the unit was judged against, e.g. code `OB-BK0503-EOL`, version 3 */
  plan: { code: string; version: number };
  failures: RepairTagFailure[];
}

/** Label printers the tag is laid out for: thermal printers come at 203 dpi (8 dots/mm) and 300 dpi. */
export const PRINTER_DPI = [203, 300] as const;
export type PrinterDpi = (typeof PRINTER_DPI)[number];

export interface RepairTagOptions {
  /** Deflate the page content (default true). Tests turn it off to read the text directly. */
  compress?: boolean;
  /** The label printer's resolution: the barcode's bars are laid on its dots (default 203) */
  dpi?: PrinterDpi;
}

const MM = 72 / 25.4;
/** Label stock: 100 mm × 70 mm, landscape */
export const TAG_WIDTH_PT = 100 * MM;
export const TAG_HEIGHT_PT = 70 * MM;
const MARGIN = 3 * MM;
/** Quiet zone each side of a Code 128 symbol: 10 X (ISO/IEC 15417, from memory). */
const QUIET_MODULES = 10;
const BAR_HEIGHT_PT = 10 * MM;
/** Narrow-bar width X we aim for: 0.33 mm reads on any handheld scanner (common practice, no source)… */
const TARGET_MODULE_MM = 0.33;
/** …and the least we go to for a long serial (common practice, no source). */
const MIN_MODULE_MM = 0.25;

/**
 * The module width X as a whole number of printer dots. A bar that is not a whole number of dots is
 * rounded edge by edge by the printer, so bars of the same width come out one dot apart — on a 2-dot
 * module that is a 50 % width error, enough to misread. No single width is whole at both 203 and 300 dpi:
 * 203 = 7·29 and 300 = 2²·3·5² share no factor, so the smallest common multiple of their dot pitches is a
 * whole inch. The tag is therefore laid out for the printer it goes to: X is the whole number of dots
 * closest to 0.33 mm (3 dots = 0.375 mm at 203 dpi, 4 dots = 0.339 mm at 300 dpi), fewer for a serial too
 * long for the label, never under 0.25 mm (2 dots = 0.250 mm at 203 dpi, 3 dots = 0.254 mm at 300 dpi).
 * @param modules the symbol's width in modules, without quiet zones
 * @param widthPt the room for the symbol and both quiet zones
 * @returns dots per module and the module width in points
 */
export function moduleDots(dpi: PrinterDpi, modules: number, widthPt: number): { dots: number; modulePt: number } {
  const dotPt = 72 / dpi;
  const minDots = Math.ceil((MIN_MODULE_MM * MM) / dotPt - 1e-9);
  let dots = Math.max(minDots, Math.round((TARGET_MODULE_MM * MM) / dotPt));
  // shrink for a long serial, but never below the least readable width
  while (dots > minDots && (modules + 2 * QUIET_MODULES) * dots * dotPt > widthPt) dots--;
  return { dots, modulePt: dots * dotPt };
}

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

/**
 * What was read, the specification and why it was rejected, written with the one formatter the screens use
 * (`formatMeasured`, src/contract/value-format.ts), so tag and screen show the same digits.
 */
export function failureDetail(f: RepairTagFailure): string {
  const m = formatMeasured(f);
  const reading = f.value === null ? 'no reading' : m.unit ? `${m.value} ${m.unit}` : m.value;
  const spec = `spec ${m.spec}`;
  if (f.verdict === 'guard_fail') {
    return `${reading}; ${spec}; inside spec, outside guard band${m.accept ? ` (accept ${m.accept})` : ''}`;
  }
  return f.value === null ? `${reading}; ${spec}` : `${reading}; ${spec}; outside spec`;
}

/** Failures grouped by step, in the order given (plan order): the step's name is printed once. */
export function byStep(failures: readonly RepairTagFailure[]): { stepName: string; lines: string[] }[] {
  const groups: { stepName: string; lines: string[] }[] = [];
  for (const f of failures) {
    let g = groups.at(-1);
    if (!g || g.stepName !== f.stepName) groups.push((g = { stepName: f.stepName, lines: [] }));
    const detail = failureDetail(f);
    g.lines.push(f.name === f.stepName ? detail : `${f.name}: ${detail}`);
  }
  return groups;
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
  const dpi = options.dpi ?? 203;
  const dotPt = 72 / dpi;

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
    // the run number is among the facts below; the heading names what the unit was judged against
    doc.font('Helvetica').fontSize(7);
    doc.text(printable(`Plan ${tag.plan.code} v${tag.plan.version}`), MARGIN, MARGIN + 4, { width: inner, align: 'right', lineBreak: false });
    const y = MARGIN + 18;
    doc.moveTo(MARGIN, y).lineTo(MARGIN + inner, y).lineWidth(0.8).stroke();
    return y + 4;
  };

  let y = heading(false);

  // barcode: module width X in whole printer dots, and the symbol starting on a dot (see moduleDots)
  const x = moduleDots(dpi, modules, inner).modulePt;
  const barX = Math.ceil((MARGIN + QUIET_MODULES * x) / dotPt - 1e-9) * dotPt;
  const barY = Math.ceil(y / dotPt - 1e-9) * dotPt;
  doc.image(png, barX, barY, { width: modules * x, height: BAR_HEIGHT_PT });
  y = barY + BAR_HEIGHT_PT + 2;
  doc.font('Courier-Bold').fontSize(11).text(tag.serial, barX, y, { lineBreak: false });
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
  const newLabel = () => {
    doc.addPage();
    y = heading(true);
    doc.font('Courier-Bold').fontSize(9).text(tag.serial, MARGIN, y, { lineBreak: false });
    y += 12;
  };
  for (const group of byStep(tag.failures)) {
    const title = printable(group.stepName);
    let titled = false;
    for (const line of group.lines) {
      const detail = printable(line);
      doc.font('Helvetica-Bold').fontSize(6.5);
      const titleH = titled ? 0 : doc.heightOfString(title, { width: inner });
      doc.font('Helvetica').fontSize(6.5);
      const detailH = doc.heightOfString(detail, { width: inner - 6 });
      if (y + titleH + detailH > bottom) {
        newLabel();
        // the step is named again at the top of a new label
        titled = false;
      }
      if (!titled) {
        doc.font('Helvetica-Bold').fontSize(6.5).text(title, MARGIN, y, { width: inner });
        y += doc.heightOfString(title, { width: inner });
        titled = true;
      }
      doc.font('Helvetica').fontSize(6.5).text(detail, MARGIN + 6, y, { width: inner - 6 });
      y += detailH + 1;
    }
    y += 1;
  }

  doc.end();
  return finished;
}
