import { describe, expect, it } from 'vitest';
import { ErrorQueue, ScpiError, formatErrorReply, formatNr3, nodeMatches, parseBoolean, parseLine, parseNumber } from './scpi';

const arg = (text: string, quoted = false) => ({ text, quoted });

describe('formatNr3', () => {
  it('writes sign, mantissa, E and a signed two-digit exponent', () => {
    // the reply format fixed in the brief and docs/architecture.md: "+5.01234E+00"
    expect(formatNr3(5.01234)).toBe('+5.01234E+00');
    expect(formatNr3(-0.0012)).toBe('-1.20000E-03');
    expect(formatNr3(0)).toBe('+0.00000E+00');
    expect(formatNr3(12)).toBe('+1.20000E+01');
    expect(formatNr3(9.999996)).toBe('+1.00000E+01');
    expect(formatNr3(1.5e-12)).toBe('+1.50000E-12');
  });

  it('sends SCPI not-a-number for non-finite values', () => {
    // SCPI-99 vol. 1 §7.2.1.5: NaN is represented as 9.91E+37 (recalled from memory)
    expect(formatNr3(Number.NaN)).toBe('+9.91000E+37');
    expect(formatNr3(Infinity)).toBe('+9.91000E+37');
  });

  it('parses back to the value within six significant digits', () => {
    for (const x of [3.3, 4.98765432, 0.000123456, 1234.5678, -7.25]) {
      expect(Number(formatNr3(x))).toBeCloseTo(x, Math.max(0, 5 - Math.floor(Math.log10(Math.abs(x)))));
    }
  });
});

describe('parseLine', () => {
  it('splits header nodes, query mark and arguments', () => {
    expect(parseLine('MEAS:VOLT:OUT?')).toMatchObject({ nodes: ['MEAS', 'VOLT', 'OUT'], query: true, args: [] });
    expect(parseLine(':sour:volt 12.5 V')).toMatchObject({ nodes: ['SOUR', 'VOLT'], query: false, args: [arg('12.5 V')] });
    expect(parseLine('*idn?')).toMatchObject({ nodes: ['*IDN'], query: true });
    expect(parseLine('UUT:SER "K5A-2648-00001","OB-BK0503", "LB-2648-03"').args).toEqual([
      arg('K5A-2648-00001', true),
      arg('OB-BK0503', true),
      arg('LB-2648-03', true),
    ]);
    expect(parseLine('CAPT:STEP 1.5,3').args).toEqual([arg('1.5'), arg('3')]);
    expect(parseLine('UUT:SER "say ""hi""",b,c').args[0]).toEqual(arg('say "hi"', true));
  });

  it('refuses malformed lines with the matching SCPI code', () => {
    const code = (line: string) => {
      try {
        parseLine(line);
        return 0;
      } catch (e) {
        return (e as ScpiError).code;
      }
    };
    expect(code('MEAS::VOLT?')).toBe(-102);
    expect(code('OUTP ON;*OPC?')).toBe(-102);
    expect(code('OUTP;*OPC?')).toBe(-102);
    expect(code('UUT:SER "abc')).toBe(-102);
    expect(code('CAPT:STEP 1,,2')).toBe(-109);
    expect(code('CAPT:STEP 1,')).toBe(-109);
    expect(code('12V')).toBe(-102);
  });
});

describe('nodeMatches', () => {
  it('accepts the short and the complete long form only, in any case', () => {
    // SCPI-99 vol. 1 §6.2.1 keyword forms (short = upper-case part), recalled from memory
    expect(nodeMatches('MEAS', 'MEASure')).toBe(true);
    expect(nodeMatches('measure', 'MEASure')).toBe(true);
    expect(nodeMatches('MEASU', 'MEASure')).toBe(false);
    expect(nodeMatches('SOUR', 'SOURce')).toBe(true);
    expect(nodeMatches('LOAD', 'LOAD')).toBe(true);
  });
});

describe('parseNumber', () => {
  it('reads NRf with the quantity’s suffixes', () => {
    expect(parseNumber(arg('12'), 'V', 'v')).toBe(12);
    expect(parseNumber(arg('+1.2e1'), 'V', 'v')).toBe(12);
    expect(parseNumber(arg('500mV'), 'V', 'v')).toBeCloseTo(0.5, 12);
    expect(parseNumber(arg('1.5 A'), 'A', 'a')).toBe(1.5);
    expect(parseNumber(arg('250 mA'), 'A', 'a')).toBeCloseTo(0.25, 12);
    // SCPI: M is milli, except MHZ, which is megahertz
    expect(parseNumber(arg('5MHz'), 'HZ', 'f')).toBe(5e6);
    expect(parseNumber(arg('200 kHz'), 'HZ', 'f')).toBe(2e5);
    expect(parseNumber(arg('.5'), 'none', 'n')).toBe(0.5);
  });

  it('refuses text (-104) and foreign suffixes (-131)', () => {
    expect(() => parseNumber(arg('twelve'), 'V', 'source voltage')).toThrow(expect.objectContaining({ code: -104 }));
    expect(() => parseNumber(arg('12', true), 'V', 'source voltage')).toThrow(expect.objectContaining({ code: -104 }));
    expect(() => parseNumber(arg('3 V'), 'A', 'load current')).toThrow(expect.objectContaining({ code: -131 }));
    expect(() => parseNumber(arg('10 A'), 'none', 'points')).toThrow(expect.objectContaining({ code: -131 }));
  });
});

describe('parseBoolean', () => {
  it('takes ON/OFF/1/0 only', () => {
    expect(parseBoolean(arg('on'), 'x')).toBe(true);
    expect(parseBoolean(arg('0'), 'x')).toBe(false);
    expect(() => parseBoolean(arg('yes'), 'OUTP')).toThrow(expect.objectContaining({ code: -224 }));
  });
});

describe('ErrorQueue', () => {
  it('pops oldest first and says 0,"No error" when empty', () => {
    const q = new ErrorQueue();
    q.push(-113, 'first');
    q.push(-222, 'second');
    expect(formatErrorReply(q.pop())).toBe('-113,"Undefined header; first"');
    expect(formatErrorReply(q.pop())).toBe('-222,"Data out of range; second"');
    expect(formatErrorReply(q.pop())).toBe('0,"No error"');
  });

  it('holds 10 entries and marks overflow with -350 in the last place', () => {
    // SCPI-99 :ERRor subsystem: on overflow the most recent entry is replaced by -350 (recalled from memory)
    const q = new ErrorQueue(10);
    for (let i = 0; i < 15; i++) q.push(-222, `error ${i}`);
    expect(q.count).toBe(10);
    const entries = q.peekAll();
    expect(entries[0].message).toMatch(/error 0$/);
    expect(entries[8].message).toMatch(/error 8$/);
    expect(entries[9]).toEqual({ code: -350, message: 'Queue overflow' });
  });

  it('doubles quotes inside the message', () => {
    expect(formatErrorReply({ code: -102, message: 'Syntax error; bad "x"' })).toBe('-102,"Syntax error; bad ""x"""');
  });
});
