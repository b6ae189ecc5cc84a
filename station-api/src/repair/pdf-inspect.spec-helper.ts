/**
 * Test helpers that read back what the repair-tag PDF contains: its text, its images, and the barcode
 * in an image. Deliberately independent of pdfkit: they parse the file bytes.
 */
import { inflateSync } from 'node:zlib';
import { decodeCode128, DecodedCode128 } from './code128';

interface PdfStream {
  dict: string;
  data: Buffer;
}

/** Every `obj … stream … endstream` in the file, with its dictionary and raw (still filtered) bytes. */
export function pdfStreams(pdf: Buffer): PdfStream[] {
  const text = pdf.toString('latin1');
  const out: PdfStream[] = [];
  const re = /obj\s*(<<[\s\S]*?>>)\s*stream\r?\n/g;
  let m: RegExpExecArray | null;
  while ((m = re.exec(text))) {
    const dict = m[1];
    const start = m.index + m[0].length;
    const len = /\/Length (\d+)/.exec(dict);
    const end = len ? start + Number(len[1]) : text.indexOf('endstream', start);
    out.push({ dict, data: pdf.subarray(start, end) });
    re.lastIndex = end;
  }
  return out;
}

function decoded(s: PdfStream): Buffer {
  return /\/Filter \/FlateDecode/.test(s.dict) ? inflateSync(s.data) : s.data;
}

// WinAnsi codes 0x80–0x9f that differ from Latin-1 (PDF 32000-1 annex D); only those the tag uses
const WIN_ANSI: Record<number, string> = { 0x85: '…', 0x96: '–', 0x97: '—', 0x91: '‘', 0x92: '’', 0x93: '“', 0x94: '”' };

function decodeHexString(hex: string): string {
  const clean = hex.replace(/\s+/g, '');
  let s = '';
  for (let i = 0; i + 1 < clean.length; i += 2) {
    const code = parseInt(clean.slice(i, i + 2), 16);
    s += WIN_ANSI[code] ?? String.fromCharCode(code);
  }
  return s;
}

/**
 * The text shown by each text operator (TJ / Tj) of every page content stream, one entry per operator,
 * with kerning gaps removed. Works on compressed and uncompressed files.
 */
export function pdfTextRuns(pdf: Buffer): string[] {
  const runs: string[] = [];
  for (const s of pdfStreams(pdf)) {
    if (/\/Subtype \/Image/.test(s.dict)) continue;
    const content = decoded(s).toString('latin1');
    const re = /\[((?:<[0-9a-fA-F\s]*>|\((?:\\.|[^\\)])*\)|[-\d.\s])*)\]\s*TJ|<([0-9a-fA-F\s]*)>\s*Tj|\(((?:\\.|[^\\)])*)\)\s*Tj/g;
    let m: RegExpExecArray | null;
    while ((m = re.exec(content))) {
      if (m[1] !== undefined) {
        const parts = m[1].match(/<[0-9a-fA-F\s]*>|\((?:\\.|[^\\)])*\)/g) ?? [];
        runs.push(parts.map((p) => (p.startsWith('<') ? decodeHexString(p.slice(1, -1)) : p.slice(1, -1).replace(/\\(.)/g, '$1'))).join(''));
      } else if (m[2] !== undefined) runs.push(decodeHexString(m[2]));
      else runs.push(m[3].replace(/\\(.)/g, '$1'));
    }
  }
  return runs;
}

/** All text of the PDF, one operator per line. */
export function pdfText(pdf: Buffer): string {
  return pdfTextRuns(pdf).join('\n');
}

export interface RasterRgb {
  width: number;
  height: number;
  /** 3 bytes per pixel, rows top to bottom */
  rgb: Buffer;
}

/** The colour images (DeviceRGB, 8 bits) embedded in the PDF, decoded to pixels. Soft masks are skipped. */
export function pdfRgbImages(pdf: Buffer): RasterRgb[] {
  return pdfStreams(pdf)
    .filter((s) => /\/Subtype \/Image/.test(s.dict) && /\/ColorSpace \/DeviceRGB/.test(s.dict))
    .map((s) => {
      if (/\/DecodeParms/.test(s.dict)) throw new Error('predictor-encoded image data is not handled by this helper');
      const width = Number(/\/Width (\d+)/.exec(s.dict)![1]);
      const height = Number(/\/Height (\d+)/.exec(s.dict)![1]);
      const rgb = decoded(s);
      if (rgb.length !== width * height * 3) throw new Error(`image data is ${rgb.length} bytes, expected ${width}×${height}×3`);
      return { width, height, rgb };
    });
}

/**
 * Decodes an 8-bit RGB or RGBA, non-interlaced PNG (what bwip-js writes) to RGB pixels. Reverses the five
 * scanline filters None, Sub, Up, Average and Paeth of the PNG specification (W3C PNG 2nd ed. §9.2,
 * definitions recalled from memory; the comparison with pdfkit's own decoding in the spec confirms them).
 */
export function decodePng(png: Buffer): RasterRgb {
  if (png.subarray(0, 8).toString('hex') !== '89504e470d0a1a0a') throw new Error('not a PNG');
  let offset = 8;
  let width = 0;
  let height = 0;
  let channels = 0;
  const idat: Buffer[] = [];
  while (offset < png.length) {
    const length = png.readUInt32BE(offset);
    const type = png.toString('ascii', offset + 4, offset + 8);
    const body = png.subarray(offset + 8, offset + 8 + length);
    if (type === 'IHDR') {
      width = body.readUInt32BE(0);
      height = body.readUInt32BE(4);
      const depth = body[8];
      const colour = body[9];
      if (depth !== 8 || (colour !== 2 && colour !== 6) || body[12] !== 0) throw new Error('only 8-bit RGB/RGBA non-interlaced PNGs are handled');
      channels = colour === 6 ? 4 : 3;
    } else if (type === 'IDAT') idat.push(body);
    offset += 12 + length;
  }
  const raw = inflateSync(Buffer.concat(idat));
  const stride = width * channels;
  const pixels = Buffer.alloc(height * stride);
  for (let y = 0; y < height; y++) {
    const filter = raw[y * (stride + 1)];
    const line = raw.subarray(y * (stride + 1) + 1, (y + 1) * (stride + 1));
    for (let i = 0; i < stride; i++) {
      const a = i >= channels ? pixels[y * stride + i - channels] : 0;
      const b = y > 0 ? pixels[(y - 1) * stride + i] : 0;
      const c = i >= channels && y > 0 ? pixels[(y - 1) * stride + i - channels] : 0;
      let predictor: number;
      switch (filter) {
        case 0: predictor = 0; break;
        case 1: predictor = a; break;
        case 2: predictor = b; break;
        case 3: predictor = (a + b) >> 1; break;
        case 4: {
          const p = a + b - c;
          const pa = Math.abs(p - a);
          const pb = Math.abs(p - b);
          const pc = Math.abs(p - c);
          predictor = pa <= pb && pa <= pc ? a : pb <= pc ? b : c;
          break;
        }
        default: throw new Error(`unknown PNG filter ${filter}`);
      }
      pixels[y * stride + i] = (line[i] + predictor) & 0xff;
    }
  }
  const rgb = Buffer.alloc(width * height * 3);
  for (let p = 0; p < width * height; p++) pixels.copy(rgb, p * 3, p * channels, p * channels + 3);
  return { width, height, rgb };
}

/**
 * Reads the Code 128 symbol across the middle row of a raster: dark/light run lengths, divided by the
 * narrowest bar's width, then {@link decodeCode128}. Leading and trailing light pixels are the quiet zone.
 */
export function readBarcode(image: RasterRgb): DecodedCode128 {
  const y = Math.floor(image.height / 2);
  const dark: boolean[] = [];
  for (let x = 0; x < image.width; x++) {
    const i = (y * image.width + x) * 3;
    dark.push(image.rgb[i] + image.rgb[i + 1] + image.rgb[i + 2] < 3 * 128);
  }
  const first = dark.indexOf(true);
  const last = dark.lastIndexOf(true);
  if (first < 0) throw new Error('no bars in the image');
  const runs: number[] = [];
  let run = 0;
  for (let x = first; x <= last; x++) {
    if (x > first && dark[x] !== dark[x - 1]) {
      runs.push(run);
      run = 0;
    }
    run++;
  }
  runs.push(run);
  const modulePx = Math.min(...runs);
  const modules = runs.map((r) => r / modulePx);
  if (modules.some((m) => !Number.isInteger(m))) throw new Error(`bar widths are not whole modules: ${modules.join(',')}`);
  return decodeCode128(modules);
}
