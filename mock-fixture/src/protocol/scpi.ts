/**
 * SCPI-style parsing and formatting shared by the simulator: headers with long and short forms, argument
 * lists, numbers with unit suffixes, NR3 replies and the error queue.
 */

/** Standard SCPI error texts for the codes the fixture uses (SCPI-99 vol. 2 ch. 21, recalled from memory). */
export const SCPI_ERROR_TEXT: Readonly<Record<number, string>> = Object.freeze({
  [-100]: 'Command error',
  [-102]: 'Syntax error',
  [-104]: 'Data type error',
  [-108]: 'Parameter not allowed',
  [-109]: 'Missing parameter',
  [-113]: 'Undefined header',
  [-131]: 'Invalid suffix',
  [-221]: 'Settings conflict',
  [-222]: 'Data out of range',
  [-223]: 'Too much data',
  [-224]: 'Illegal parameter value',
  [-230]: 'Data corrupt or stale',
  [-300]: 'Device-specific error',
  [-350]: 'Queue overflow',
});

/** A refusal with an SCPI error code and a detail a person can act on. */
export class ScpiError extends Error {
  constructor(
    readonly code: number,
    readonly detail: string,
  ) {
    super(`${code},"${SCPI_ERROR_TEXT[code] ?? 'Error'}; ${detail}"`);
    this.name = 'ScpiError';
  }
}

/** An entry of the error queue as `SYST:ERR?` reports it. */
export interface QueuedError {
  code: number;
  message: string;
}

/**
 * The SCPI error/event queue: first in, first out, at most `capacity` entries. When an error arrives at a
 * full queue the newest entry is replaced by -350 "Queue overflow" (SCPI-99 :ERRor subsystem rule,
 * recalled from memory), so the oldest errors, usually the cause, survive.
 */
export class ErrorQueue {
  private readonly entries: QueuedError[] = [];

  constructor(readonly capacity = 10) {}

  push(code: number, detail?: string): void {
    const base = SCPI_ERROR_TEXT[code] ?? 'Error';
    const message = detail ? `${base}; ${detail}` : base;
    if (this.entries.length < this.capacity) {
      this.entries.push({ code, message });
      return;
    }
    this.entries[this.capacity - 1] = { code: -350, message: SCPI_ERROR_TEXT[-350] };
  }

  /** Remove and return the oldest entry, or 0 "No error" when empty. */
  pop(): QueuedError {
    return this.entries.shift() ?? { code: 0, message: 'No error' };
  }

  get count(): number {
    return this.entries.length;
  }

  clear(): void {
    this.entries.length = 0;
  }

  /** Copies of the queued entries, oldest first. */
  peekAll(): QueuedError[] {
    return this.entries.map((e) => ({ ...e }));
  }
}

/** `SYST:ERR?` reply text: `<code>,"<message>"` with embedded double quotes doubled (SCPI string rule). */
export function formatErrorReply(error: QueuedError): string {
  return `${error.code},"${error.message.replace(/"/g, '""')}"`;
}

/** SCPI's not-a-number value (9.91E+37), sent when a numeric query cannot be answered. */
export const SCPI_NAN = 9.91e37;

/**
 * Format a number as NR3 with six significant digits: sign, one digit, point, five digits, `E`, signed
 * two-digit exponent (e.g. `+5.01234E+00`, `-1.20000E-03`). Non-finite values become SCPI NaN.
 */
export function formatNr3(value: number): string {
  const v = Number.isFinite(value) ? value : SCPI_NAN;
  const [mantissa, exponent] = v.toExponential(5).split('e');
  const sign = mantissa.startsWith('-') ? '-' : '+';
  const digits = mantissa.replace('-', '');
  const expNumber = Number(exponent);
  const expSign = expNumber < 0 ? '-' : '+';
  return `${sign}${digits}E${expSign}${String(Math.abs(expNumber)).padStart(2, '0')}`;
}

/** One line split into its header and raw arguments. */
export interface ParsedLine {
  /** Header nodes as sent, without the leading colon and the `?` (e.g. ['MEAS','VOLT','OUT'] or ['*IDN']) */
  nodes: string[];
  query: boolean;
  /** Arguments, unquoted, in order; `quoted` tells which were quoted strings */
  args: Array<{ text: string; quoted: boolean }>;
  /** The header as typed, for messages */
  headerText: string;
}

const HEADER_RE = /^(?:\*[A-Za-z]+|:?[A-Za-z][A-Za-z0-9]*(?::[A-Za-z][A-Za-z0-9]*)*)\??$/;

/**
 * Split one command line. Throws ScpiError -102 for malformed lines. Compound lines (`;`) are refused
 * with a message: the fixture takes one command per line.
 */
export function parseLine(line: string): ParsedLine {
  const text = line.trim();
  const split = text.search(/\s/);
  const headerText = split < 0 ? text : text.slice(0, split);
  const argText = split < 0 ? '' : text.slice(split).trim();
  if (!HEADER_RE.test(headerText)) {
    if (headerText.includes(';')) throw new ScpiError(-102, `one command per line; ${headerText} holds ;`);
    throw new ScpiError(-102, `${headerText} is not a command header (letters and colons, optionally ending in ?)`);
  }
  const query = headerText.endsWith('?');
  const bare = (query ? headerText.slice(0, -1) : headerText).replace(/^:/, '');
  const nodes = bare.startsWith('*') ? [bare.toUpperCase()] : bare.split(':').map((n) => n.toUpperCase());
  return { nodes, query, args: argText === '' ? [] : splitArgs(argText), headerText };
}

function splitArgs(text: string): Array<{ text: string; quoted: boolean }> {
  const args: Array<{ text: string; quoted: boolean }> = [];
  let i = 0;
  for (;;) {
    while (text[i] === ' ' || text[i] === '\t') i++;
    if (i >= text.length || text[i] === ',') {
      throw new ScpiError(-109, 'an argument is empty (two commas in a row, or a trailing comma)');
    }
    if (text[i] === '"' || text[i] === "'") {
      const quote = text[i];
      let value = '';
      i++;
      for (;;) {
        if (i >= text.length) throw new ScpiError(-102, `a string argument is missing its closing quote`);
        if (text[i] === quote) {
          if (text[i + 1] === quote) {
            value += quote;
            i += 2;
            continue;
          }
          i++;
          break;
        }
        value += text[i++];
      }
      args.push({ text: value, quoted: true });
      while (text[i] === ' ' || text[i] === '\t') i++;
    } else {
      const end = text.indexOf(',', i);
      const raw = (end < 0 ? text.slice(i) : text.slice(i, end)).trim();
      if (raw.includes(';')) throw new ScpiError(-102, 'one command per line; the line holds ;');
      if (/["']/.test(raw)) throw new ScpiError(-102, `misplaced quote in argument ${raw}`);
      args.push({ text: raw, quoted: false });
      i = end < 0 ? text.length : end;
    }
    if (i >= text.length) return args;
    if (text[i] !== ',') throw new ScpiError(-102, `expected a comma between arguments, found '${text.slice(i, i + 8)}'`);
    i++;
  }
}

/**
 * Does a typed header node match a SCPI mnemonic written in the usual style (upper-case short form, then the
 * rest in lower case, e.g. `MEASure`)? Only the short and the complete long form are accepted.
 */
export function nodeMatches(typed: string, mnemonic: string): boolean {
  const shortForm = mnemonic.replace(/[a-z]+$/, '');
  const upper = typed.toUpperCase();
  return upper === shortForm.toUpperCase() || upper === mnemonic.toUpperCase();
}

/** Physical quantity of a numeric argument and the suffixes it accepts (multipliers to SI). */
export type NumericUnit = 'V' | 'A' | 'HZ' | 'none';
const SUFFIXES: Record<NumericUnit, Record<string, number>> = {
  V: { '': 1, V: 1, MV: 1e-3 },
  A: { '': 1, A: 1, MA: 1e-3 },
  // in SCPI "M" means milli, but MHZ is the accepted exception for megahertz
  HZ: { '': 1, HZ: 1, KHZ: 1e3, MHZ: 1e6 },
  none: { '': 1 },
};
const NUMBER_RE = /^([+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?)\s*([A-Za-z]*)$/;

/**
 * Parse a decimal argument (NRf) with an optional unit suffix, returning SI units.
 * @throws ScpiError -104 when it is not a number, -131 for a suffix the quantity does not take
 */
export function parseNumber(arg: { text: string; quoted: boolean }, unit: NumericUnit, what: string): number {
  const match = arg.quoted ? null : NUMBER_RE.exec(arg.text);
  if (!match) throw new ScpiError(-104, `${what} must be a number${unit === 'none' ? '' : ` (optionally with ${Object.keys(SUFFIXES[unit]).filter(Boolean).join('/')})`}, got '${arg.text}'`);
  const suffix = match[2].toUpperCase();
  const multiplier = SUFFIXES[unit][suffix];
  if (multiplier === undefined) {
    const allowed = Object.keys(SUFFIXES[unit]).filter(Boolean);
    throw new ScpiError(-131, `${what} does not take the suffix '${match[2]}'${allowed.length ? ` (use ${allowed.join(', ')} or none)` : ''}`);
  }
  const value = Number(match[1]) * multiplier;
  if (!Number.isFinite(value)) throw new ScpiError(-104, `${what} is not a finite number`);
  return value;
}

/**
 * Parse ON|OFF|1|0.
 * @throws ScpiError -224 for anything else
 */
export function parseBoolean(arg: { text: string; quoted: boolean }, what: string): boolean {
  const upper = arg.quoted ? '' : arg.text.toUpperCase();
  if (upper === 'ON' || upper === '1') return true;
  if (upper === 'OFF' || upper === '0') return false;
  throw new ScpiError(-224, `${what} takes ON, OFF, 1 or 0, got '${arg.text}'`);
}
