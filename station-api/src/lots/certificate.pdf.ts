import PDFDocument from 'pdfkit';
import { formatFigure, formatLimits, formatValue } from '../contract/value-format';
import type { CertificateContent, QuantitySummary } from './certificate-content';

/** A4 portrait in points. */
const PAGE_W = 595.28;
const PAGE_H = 841.89;
const MARGIN = 48;
const INNER = PAGE_W - 2 * MARGIN;
const BOTTOM = PAGE_H - MARGIN - 18;
const RULE_GREY = '#8a8f96';
const LABEL_GREY = '#4a4f57';

/** Characters the built-in PDF fonts (WinAnsi) can show; others become a readable stand-in or "?". */
export function printable(text: string): string {
  return text
    .replace(/≤/g, '<=')
    .replace(/≥/g, '>=')
    .replace(/σ/g, 's')
    .replace(/Ω/g, 'Ohm')
    .replace(/[^\x20-\x7e\xa0-\xff‘’“”–—…•€™]/g, '?');
}

/** The text, cut and ended with "…" when wider than `widthPt` in the current font (a fact never runs into the next). */
function fitWidth(doc: PDFKit.PDFDocument, text: string, widthPt: number): string {
  if (doc.widthOfString(text) <= widthPt) return text;
  let cut = text;
  while (cut.length > 1 && doc.widthOfString(`${cut}…`) > widthPt) cut = cut.slice(0, -1);
  return `${cut.trimEnd()}…`;
}

/** "2026-12-02" and "2026-12-02 14:07" in the server's local time (the plant's wall clock). */
export function localDate(d: Date): string {
  const p = (n: number) => String(n).padStart(2, '0');
  return `${d.getFullYear()}-${p(d.getMonth() + 1)}-${p(d.getDate())}`;
}
export function localDateTime(d: Date): string {
  const p = (n: number) => String(n).padStart(2, '0');
  return `${localDate(d)} ${p(d.getHours())}:${p(d.getMinutes())}`;
}

/** "96.4 % (95 % CI 91.0 % – 98.6 %)", or "no unit tested". Percent with one decimal, as the yield screen shows. */
export function percentWithInterval(p: { x: number; n: number; estimate: number | null; lower: number; upper: number }): string {
  if (p.estimate === null) return 'no unit tested';
  const pct = (v: number) => `${(v * 100).toFixed(1)} %`;
  return `${p.x} of ${p.n} = ${pct(p.estimate)}   (95 % interval ${pct(p.lower)} – ${pct(p.upper)})`;
}

interface Column {
  title: string;
  width: number;
  align?: 'left' | 'right';
  font?: string;
  /** points; default 8 */
  size?: number;
}

/** `low … high` at the digits the screens use, without the unit (the table has a unit column). */
function limitsWithoutUnit(q: QuantitySummary): string {
  const text = formatLimits(q.lowLimit, q.highLimit, q.quantity, q.unit);
  const suffix = ` ${q.unit}`;
  return q.unit && text.endsWith(suffix) ? text.slice(0, -suffix.length) : text;
}

/** One line of a quantity's statistics, written with the formatter the screens use (contract/value-format.ts). */
export function statisticsCells(q: QuantitySummary): string[] {
  const v = (x: number) => formatValue(x, q.quantity, q.unit).text;
  // σ one digit finer than the value, so a small spread does not print as 0
  const sdDigits = formatValue(q.mean, q.quantity, q.unit).text.split('.')[1]?.length ?? 0;
  return [
    q.name === q.stepName ? q.name : `${q.stepName}: ${q.name}`,
    q.unit,
    String(q.n),
    v(q.mean),
    q.sd === null ? '—' : formatFigure(q.sd, sdDigits + 1),
    v(q.min),
    v(q.max),
    limitsWithoutUnit(q),
    q.cpk === null ? `— (${q.cpkNote ?? 'n/a'})` : q.cpk.toFixed(2),
  ];
}

/**
 * Renders the certificate of conformance of a released lot (A4, one or more pages): what was released, against
 * which plan versions and on which calibrated fixtures it was tested, its yield with Wilson score intervals,
 * the spread of its key quantities, and who released it when.
 */
export function renderCertificate(c: CertificateContent, options: { compress?: boolean } = {}): Promise<Buffer> {
  const doc = new PDFDocument({
    size: 'A4',
    margin: MARGIN,
    compress: options.compress ?? true,
    bufferPages: true,
    // fixed dates: the document says when it was issued, not when these bytes were written
    info: { Title: `Certificate of conformance, lot ${c.lot.code}`, Subject: c.certificateNo, Creator: 'Railwright', CreationDate: c.release.at, ModDate: c.release.at },
  });
  const chunks: Buffer[] = [];
  doc.on('data', (b: Buffer) => chunks.push(b));
  const done = new Promise<Buffer>((resolve, reject) => {
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
  });

  let y = MARGIN;
  const ensure = (h: number) => {
    if (y + h > BOTTOM) {
      doc.addPage();
      y = MARGIN;
    }
  };
  const rule = (weight = 0.5) => {
    doc.moveTo(MARGIN, y).lineTo(MARGIN + INNER, y).lineWidth(weight).strokeColor(RULE_GREY).stroke();
  };
  const section = (title: string, note?: string) => {
    ensure(48);
    y += 10;
    doc.font('Helvetica-Bold').fontSize(11).fillColor('black').text(printable(title), MARGIN, y, { lineBreak: false });
    y += 15;
    if (note) {
      doc.font('Helvetica').fontSize(8).fillColor(LABEL_GREY);
      doc.text(printable(note), MARGIN, y, { width: INNER });
      y += doc.heightOfString(printable(note), { width: INNER }) + 3;
    }
  };
  const table = (cols: Column[], rows: string[][], empty: string) => {
    const header = () => {
      let x = MARGIN;
      doc.font('Helvetica-Bold').fontSize(7.5).fillColor(LABEL_GREY);
      for (const col of cols) {
        doc.text(printable(col.title), x + 2, y, { width: col.width - 4, align: col.align ?? 'left', lineBreak: false });
        x += col.width;
      }
      y += 11;
      rule(0.4);
      y += 3;
    };
    ensure(30);
    header();
    if (rows.length === 0) {
      doc.font('Helvetica-Oblique').fontSize(8).fillColor('black').text(printable(empty), MARGIN + 2, y, { lineBreak: false });
      y += 12;
      return;
    }
    for (const row of rows) {
      const heights = row.map((cell, i) => doc.font(cols[i].font ?? 'Helvetica').fontSize(cols[i].size ?? 8).heightOfString(printable(cell), { width: cols[i].width - 4 }));
      const h = Math.max(...heights) + 3;
      if (y + h > BOTTOM) {
        doc.addPage();
        y = MARGIN;
        header();
      }
      let x = MARGIN;
      row.forEach((cell, i) => {
        doc.font(cols[i].font ?? 'Helvetica').fontSize(cols[i].size ?? 8).fillColor('black');
        doc.text(printable(cell), x + 2, y, { width: cols[i].width - 4, align: cols[i].align ?? 'left' });
        x += cols[i].width;
      });
      y += h;
    }
  };
  const facts = (pairs: [string, string][], perRow: number) => {
    const w = INNER / perRow;
    for (let i = 0; i < pairs.length; i += perRow) {
      ensure(26);
      pairs.slice(i, i + perRow).forEach(([label, value], j) => {
        doc.font('Helvetica').fontSize(7).fillColor(LABEL_GREY).text(printable(label.toUpperCase()), MARGIN + j * w, y, { width: w - 6, lineBreak: false });
        doc.font('Helvetica-Bold').fontSize(10).fillColor('black');
        doc.text(fitWidth(doc, printable(value), w - 6), MARGIN + j * w, y + 9, { width: w - 6, lineBreak: false });
      });
      y += 26;
    }
  };

  // heading
  doc.font('Helvetica-Bold').fontSize(18).fillColor('black').text('Certificate of conformance', MARGIN, y, { lineBreak: false });
  doc.font('Helvetica').fontSize(8).fillColor(LABEL_GREY).text(printable(`No. ${c.certificateNo}`), MARGIN, y + 4, { width: INNER, align: 'right', lineBreak: false });
  y += 26;
  rule(1.2);
  y += 8;
  facts(
    [
      ['Lot', c.lot.code],
      ['Part number', c.product.partNumber],
      ['Lot opened', localDate(c.lot.createdAt)],
    ],
    3,
  );
  facts([['Product', c.product.name]], 1);
  facts(
    [
      ['Planned', String(c.lot.plannedQuantity)],
      ['Registered', String(c.quantities.registered)],
      ['Passed (conforming)', String(c.quantities.passed)],
      ['Scrapped', String(c.quantities.scrapped)],
    ],
    4,
  );
  const statement =
    `Each of the ${c.quantities.passed} conforming units of lot ${c.lot.code} passed its last end-of-line test against a released test plan below, ` +
    `on a fixture listed below. ${c.quantities.scrapped} ${c.quantities.scrapped === 1 ? 'unit was' : 'units were'} scrapped and ${c.quantities.scrapped === 1 ? 'is' : 'are'} not part of the delivery. ` +
    'The measurements behind every figure are kept in the station records and can be traced unit by unit.';
  doc.font('Helvetica').fontSize(9).fillColor('black');
  ensure(40);
  doc.text(printable(statement), MARGIN, y, { width: INNER });
  y += doc.heightOfString(printable(statement), { width: INNER }) + 4;

  section('Test plan versions', 'Every plan version the lot’s runs used, with the checksum (SHA-256) of its released content.');
  table(
    [
      { title: 'Plan', width: 120 },
      { title: 'Version', width: 44, align: 'right' },
      // a SHA-256 in hex is 64 characters: 7.5 pt Courier keeps it on one line
      { title: 'Checksum', width: 300, font: 'Courier', size: 7.5 },
      { title: 'Runs', width: INNER - 464, align: 'right' },
    ],
    c.planVersions.map((p) => [`${p.planCode}${p.planName ? `  ${p.planName}` : ''}`, `v${p.version}`, p.checksum, String(p.runs)]),
    'No runs recorded for this lot.',
  );

  section('Fixtures', 'Calibration due date as recorded when the lot’s first run on the fixture started, and as it stands today.');
  table(
    [
      { title: 'Fixture', width: 70 },
      { title: 'Name', width: 180 },
      { title: 'Runs', width: 50, align: 'right' },
      { title: 'Calibration due (at test)', width: 100 },
      { title: 'Calibration due (now)', width: INNER - 400 },
    ],
    c.fixtures.map((f) => [f.code, f.name, String(f.runs), f.calibrationDueAtTest ? localDate(f.calibrationDueAtTest) : '—', f.calibrationDueNow ? localDate(f.calibrationDueNow) : '—']),
    'No fixture recorded for this lot.',
  );

  section('Yield', `Method: ${c.yield.definitions.interval}. Units tested: ${c.yield.unitsTested}.`);
  facts(
    [
      ['First-pass yield', percentWithInterval(c.yield.firstPass)],
      ['Final yield', percentWithInterval(c.yield.final)],
    ],
    1,
  );
  doc.font('Helvetica').fontSize(7.5).fillColor(LABEL_GREY);
  for (const d of [`First-pass yield: ${c.yield.definitions.firstPass}.`, `Final yield: ${c.yield.definitions.final}.`]) {
    ensure(12);
    doc.text(printable(d), MARGIN, y, { width: INNER });
    y += doc.heightOfString(printable(d), { width: INNER }) + 1;
  }

  section('Key quantities', c.statisticsBasis);
  table(
    [
      { title: 'Quantity', width: 148 },
      { title: 'Unit', width: 30 },
      { title: 'n', width: 30, align: 'right' },
      { title: 'Mean', width: 44, align: 'right' },
      { title: 'Std dev', width: 44, align: 'right' },
      { title: 'Min', width: 44, align: 'right' },
      { title: 'Max', width: 44, align: 'right' },
      { title: 'Limits', width: 70, align: 'right' },
      { title: 'Cpk', width: INNER - 454, align: 'right' },
    ],
    c.statistics.map(statisticsCells),
    'No measured values for the conforming units.',
  );

  section('Release');
  facts(
    [
      ['Released by', c.release.by],
      ['Date', localDateTime(c.release.at)],
    ],
    2,
  );
  if (c.release.comment) {
    const text = `Comment: ${c.release.comment}`;
    doc.font('Helvetica').fontSize(9).fillColor('black');
    ensure(doc.heightOfString(printable(text), { width: INNER }) + 4);
    doc.text(printable(text), MARGIN, y, { width: INNER });
    y += doc.heightOfString(printable(text), { width: INNER }) + 4;
  }

  // page footers, written once every page exists
  const range = doc.bufferedPageRange();
  for (let i = range.start; i < range.start + range.count; i++) {
    doc.switchToPage(i);
    // below the bottom margin pdfkit would open a new page for the footer
    doc.page.margins.bottom = 0;
    doc.font('Helvetica').fontSize(7).fillColor(LABEL_GREY);
    doc.text(printable(`${c.certificateNo} · lot ${c.lot.code} · page ${i + 1} of ${range.count}`), MARGIN, PAGE_H - MARGIN, { width: INNER, align: 'center', lineBreak: false });
  }
  doc.end();
  return done;
}
