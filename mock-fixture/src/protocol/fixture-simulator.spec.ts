import { describe, expect, it } from 'vitest';
import { solveOperatingPoint } from '../physics/operating-point';
import { PRODUCTS } from '../products';
import { FixtureSimulator, REALISTIC_TIMING, type FixtureSimulatorOptions } from './fixture-simulator';

const SERIAL = 'K5A-2648-00042';
const LOT = 'LB-2648-03';
const goodOnly = { defectRates: {} };

function fixture(options: Partial<FixtureSimulatorOptions> = {}) {
  const sim = new FixtureSimulator({ fixtureId: 'FX-101', timing: 'instant', config: goodOnly, ...options });
  const send = (line: string) => sim.handleLine(line);
  const num = async (line: string) => Number(await send(line));
  const errors = async () => {
    const out: string[] = [];
    for (;;) {
      const e = (await send('SYST:ERR?'))!;
      if (e.startsWith('0,')) return out;
      out.push(e);
    }
  };
  return { sim, send, num, errors };
}

async function powerUp(f: ReturnType<typeof fixture>, vinV = 12, serial = SERIAL, part = 'OB-BK0503') {
  for (const line of [`UUT:SER "${serial}","${part}","${LOT}"`, `SOUR:VOLT ${vinV}`, 'OUTP ON', 'LOAD OFF']) {
    expect(await f.send(line)).toBeNull();
  }
  expect(await f.send('*OPC?')).toBe('1');
}

describe('identification and housekeeping', () => {
  it('answers *IDN? with maker, model, fixture id and firmware', async () => {
    const { send } = fixture();
    expect(await send('*IDN?')).toMatch(/^RAILWRIGHT,SIM-FIXTURE,FX-101,\d+\.\d+\.\d+$/);
  });

  it('refuses bad constructor options with a clear message', () => {
    expect(() => new FixtureSimulator({ fixtureId: 'FX,1', timing: 'instant' })).toThrow(/fixtureId/);
    expect(() => new FixtureSimulator({ fixtureId: 'FX-1', timing: 'slow' as never })).toThrow(/timing/);
    expect(() => new FixtureSimulator({ fixtureId: 'FX-1', timing: 'instant', config: { defectRates: { x: 1 } } as never })).toThrow(/not a defect/);
    expect(() => new FixtureSimulator({ fixtureId: 'FX-1', timing: 'instant', defaultUnit: { partNumber: 'NOPE' } })).toThrow(/not a known product/);
  });

  it('accepts long and short forms in any case', async () => {
    const f = fixture();
    await f.send('SOURce:VOLTage 12.5');
    expect(await f.send('sour:volt?')).toBe('+1.25000E+01');
    await f.send(':OUTPut:STATe on');
    expect(await f.send('outp?')).toBe('1');
    await f.send('LOAD:CURRent:LEVel 250 mA');
    expect(await f.send('LOAD:CURR?')).toBe('+2.50000E-01');
    await f.send('LOAD:STAT 1');
    expect(await f.send('LOAD?')).toBe('1');
    await f.send('capture:rate 10 MHz');
    expect(await f.send('CAPT:RATE?')).toBe('+1.00000E+07');
    expect(await f.errors()).toEqual([]);
  });

  // the station confirms its safe state by these two queries (docs/fixture-protocol.md, "Safe state"):
  // they must report what the fixture really does, not what was last asked
  it('answers OUTP? and LOAD? with the source and load state it is really in', async () => {
    const f = fixture();
    expect([await f.send('OUTP?'), await f.send('LOAD?')]).toEqual(['0', '0']);
    await powerUp(f);
    await f.send('LOAD:CURR 3');
    await f.send('LOAD ON');
    expect([await f.send('OUTP?'), await f.send('LOAD?')]).toEqual(['1', '1']);
    await f.send('LOAD OFF');
    expect([await f.send('OUTP?'), await f.send('LOAD?')]).toEqual(['1', '0']);
    await f.send('OUTP OFF');
    expect([await f.send('OUTP?'), await f.send('LOAD?')]).toEqual(['0', '0']);
    await powerUp(f);
    await f.send('LOAD ON');
    await f.send('*RST');
    expect([await f.send('OUTP?'), await f.send('LOAD?')]).toEqual(['0', '0']);
    expect(f.sim.state()).toMatchObject({ sourceOn: false, loadOn: false });
  });

  it('resets source, load and capture on *RST but keeps the error queue until *CLS', async () => {
    const f = fixture();
    await powerUp(f);
    await f.send('LOAD:CURR 2');
    await f.send('LOAD ON');
    await f.send('CAPT:POIN 200');
    await f.send('CAPT:STEP 1,2');
    await f.send('BOGUS');
    await f.send('*RST');
    expect(f.sim.state()).toMatchObject({ sourceOn: false, sourceV: 0, loadOn: false, loadA: 0, capturePoints: 1000, step: null });
    expect(await f.send('SYST:ERR:COUN?')).toBe('1');
    await f.send('*CLS');
    expect(await f.send('SYST:ERR?')).toBe('0,"No error"');
    // the clamped unit survives *RST
    expect(await f.send('UUT:SER?')).toBe(`"${SERIAL}","OB-BK0503","${LOT}"`);
  });

  it('ignores empty lines and a trailing carriage return', async () => {
    const f = fixture();
    expect(await f.send('')).toBeNull();
    expect(await f.send('*OPC?\r')).toBe('1');
    expect(await f.send('*OPC?\r\n')).toBe('1');
  });
});

describe('errors', () => {
  it('queues the matching SCPI code with an actionable message', async () => {
    const f = fixture();
    const cases: Array<[string, RegExp]> = [
      ['SOUR:VOLT 61', /^-222,"Data out of range; source voltage 61 V is outside 0 to 60 V"$/],
      ['SOUR:VOLT -1', /^-222,/],
      ['LOAD:CURR 10.5', /^-222,"Data out of range; load current 10.5 A is outside 0 to 10 A"$/],
      ['CAPT:POIN 5', /^-222,.*whole number from 10/],
      ['CAPT:POIN 100.5', /^-222,/],
      ['CAPT:RATE 10', /^-222,/],
      ['PROT:TEST? 11', /^-222,/],
      ['SOUR:VOLT', /^-109,"Missing parameter; expected SOUR:VOLT <volts>"$/],
      ['*IDN? 3', /^-108,/],
      ['SOUR:VOLT 1,2', /^-108,/],
      ['MEAS:FREQ?', /^-113,"Undefined header; MEAS:FREQ\? is not a command/],
      ['CAPT:INIT?', /^-113,.*has no query form/],
      ['MEAS:VOLT:OUT', /^-113,.*is a query only/],
      ['!!!', /^-102,/],
      ['OUTP MAYBE', /^-224,"Illegal parameter value; OUTP takes ON, OFF, 1 or 0, got 'MAYBE'"$/],
      ['SOUR:VOLT 5 A', /^-131,/],
      ['LOAD:CURR lots', /^-104,/],
      ['CAPT:DATA?', /^-230,.*send CAPT:INIT first/],
      ['CAPT:STEP 2,2', /^-224,/],
      ['UUT:SER "only-one"', /^-109,/],
      ['UUT:RAT 24,5,2', /^-221,.*send UUT:SER before UUT:RAT/],
    ];
    for (const [line, expected] of cases) {
      await f.send(line);
      const errs = await f.errors();
      expect(errs, line).toHaveLength(1);
      expect(errs[0], line).toMatch(expected);
    }
  });

  it('answers a failed query with one line (SCPI NaN) so replies stay in step', async () => {
    const f = fixture();
    expect(await f.send('MEAS:FREQ?')).toBe('+9.91000E+37');
    expect(await f.send('CAPT:DATA?')).toBe('+9.91000E+37');
    expect(await f.send('PROT:TEST?')).toBe('+9.91000E+37');
    expect(await f.send('OUTP MAYBE')).toBeNull();
    expect(await f.send('SYST:ERR:COUN?')).toBe('4');
  });

  it('keeps 10 errors and reports the overflow as -350', async () => {
    const f = fixture();
    for (let i = 0; i < 12; i++) await f.send(`SOUR:VOLT ${100 + i}`);
    const errs = await f.errors();
    expect(errs).toHaveLength(10);
    expect(errs[0]).toMatch(/source voltage 100 V/);
    expect(errs[9]).toBe('-350,"Queue overflow"');
  });

  it('refuses non-ASCII, compound and over-long lines', async () => {
    const f = fixture();
    await f.send('SOUR:VOLT 12µ');
    await f.send('OUTP ON;*OPC?');
    await f.send(`UUT:SER "${'x'.repeat(5000)}",a,b`);
    const errs = await f.errors();
    expect(errs[0]).toMatch(/^-102,.*non-printable or non-ASCII/);
    expect(errs[1]).toMatch(/^-102,.*one command per line/);
    expect(errs[2]).toMatch(/^-223,/);
  });
});

describe('safety', () => {
  it('never outputs with the source off, and says so for output-side readings', async () => {
    const f = fixture();
    await f.send(`UUT:SER "${SERIAL}","OB-BK0503","${LOT}"`);
    await f.send('SOUR:VOLT 12');
    await f.send('LOAD:CURR 1');
    await f.send('LOAD ON');
    expect(Math.abs(await f.num('MEAS:VOLT:OUT?'))).toBeLessThan(2e-3);
    expect(Math.abs(await f.num('MEAS:VOLT:IN?'))).toBeLessThan(5e-3);
    expect(Math.abs(await f.num('MEAS:CURR:IN?'))).toBeLessThan(1e-4);
    expect(await f.errors()).toEqual([
      '-221,"Settings conflict; MEAS:VOLT:OUT? with the input source off reads nothing; send OUTP ON first"',
    ]);
  });

  it('goes to the safe state on request', async () => {
    const f = fixture();
    await powerUp(f);
    await f.send('LOAD ON');
    f.sim.enterSafeState('test');
    expect(f.sim.state()).toMatchObject({ sourceOn: false, loadOn: false });
    expect(f.sim.safeStateReason).toBe('test');
  });

  it('switches source and load off on an internal fault and reports -300', async () => {
    const broken = {
      partNumber: 'BAD-1',
      get design(): never {
        throw new Error('model exploded');
      },
    };
    const f = fixture({ products: { 'BAD-1': broken as never } });
    await powerUp(f);
    await f.send('LOAD ON');
    expect(await f.send('UUT:SER "S1","BAD-1","L1"')).toBeNull();
    expect(f.sim.state()).toMatchObject({ sourceOn: false, loadOn: false });
    const errs = await f.errors();
    expect(errs[0]).toMatch(/^-300,"Device-specific error; internal fault, source and load switched off: model exploded"$/);
  });
});

describe('measuring a good unit', () => {
  it('runs every step kind of docs/architecture.md and reads what the model predicts', async () => {
    const f = fixture();
    const product = PRODUCTS['OB-BK0503'];
    await powerUp(f);
    const unit = (f.sim as unknown as { unit: { model: Parameters<typeof solveOperatingPoint>[0] } }).unit.model;
    const model = (vinV: number, loadA: number) => solveOperatingPoint(unit, { sourceOn: true, vinV, loadA });

    // input_current_no_load
    const iinNoLoadA = await f.num('MEAS:CURR:IN?');
    expect(iinNoLoadA).toBeCloseTo(model(12, 0).iinA, 3);
    expect(iinNoLoadA * 1000).toBeGreaterThan(4);
    expect(iinNoLoadA * 1000).toBeLessThan(20);

    // vout_no_load
    const voutNoLoad = await f.num('MEAS:VOLT:OUT?');
    expect(voutNoLoad).toBeCloseTo(model(12, 0).voutV, 2);
    expect(Math.abs(voutNoLoad / 5 - 1)).toBeLessThan(0.02);

    // vout_at_load, efficiency
    for (const loadA of [0.5, 1.5, 3]) {
      await f.send(`LOAD:CURR ${loadA}`);
      await f.send('LOAD ON');
      expect(await f.send('*OPC?')).toBe('1');
      const vin = await f.num('MEAS:VOLT:IN?');
      const iin = await f.num('MEAS:CURR:IN?');
      const vout = await f.num('MEAS:VOLT:OUT?');
      const iout = await f.num('MEAS:CURR:OUT?');
      const expected = model(12, loadA);
      expect(vout).toBeCloseTo(expected.voutV, 2);
      expect(iout).toBeCloseTo(loadA, 2);
      // η = V_out·I_out/(V_in·I_in) from the four readings (textbook definition, docs/reference.md)
      expect((100 * vout * iout) / (vin * iin)).toBeCloseTo(expected.efficiencyPct!, 0);
    }

    // line_regulation at full load
    const atLine: number[] = [];
    for (const vinV of [product.vinMinV, product.vinNomV, product.vinMaxV]) {
      await f.send(`SOUR:VOLT ${vinV}`);
      await f.send('*OPC?');
      atLine.push(await f.num('MEAS:VOLT:OUT?'));
    }
    // LN3 (codingace.net line-regulation page): (max − min)/V at nominal, in %; small for a good unit
    expect(((Math.max(...atLine) - Math.min(...atLine)) / atLine[1]) * 100).toBeLessThan(0.5);
    await f.send('SOUR:VOLT 12');

    // ripple at full load
    await f.send('CAPT:RATE 20 MHz');
    await f.send('CAPT:POIN 2000');
    await f.send('CAPT:STEP OFF');
    expect(await f.send('CAPT:INIT')).toBeNull();
    const record = (await f.send('CAPT:DATA?'))!.split(',').map(Number);
    expect(record).toHaveLength(2000);
    const ripplePp = Math.max(...record) - Math.min(...record);
    expect(ripplePp * 1000).toBeGreaterThan(5);
    expect(ripplePp * 1000).toBeLessThan(25);

    // load_step 1.5 → 3 A
    await f.send('CAPT:RATE 5e6');
    await f.send('CAPT:POIN 1000');
    await f.send('CAPT:STEP 1.5,3');
    expect(await f.send('CAPT:STEP?')).toBe('+1.50000E+00,+3.00000E+00');
    await f.send('CAPT:INIT');
    const step = (await f.send('CAPT:DATA?'))!.split(',').map(Number);
    const before = step.slice(0, 201).reduce((a, b) => a + b, 0) / 201;
    const undershootMv = (before - Math.min(...step.slice(201))) * 1000;
    expect(undershootMv).toBeGreaterThan(60);
    expect(undershootMv).toBeLessThan(250);

    // protection
    const prot = (await f.send('PROT:TEST? 6'))!.split(',');
    expect(prot.slice(0, 2)).toEqual(['1', '1']);
    expect(Number(prot[2])).toBeLessThan(2.5);
    expect(Number(prot[3])).toBeCloseTo(model(12, 3).voutV, 2);

    expect(await f.send('MEAS:TEMP:HOT?')).toBe('0');
    expect(await f.errors()).toEqual([]);
  });

  it('models the same serial the same way and different serials differently', async () => {
    const script = async (serial: string) => {
      const f = fixture();
      await powerUp(f, 12, serial);
      await f.send('LOAD:CURR 2');
      await f.send('LOAD ON');
      return [await f.send('MEAS:VOLT:OUT?'), await f.send('MEAS:CURR:IN?')];
    };
    expect(await script(SERIAL)).toEqual(await script(SERIAL));
    expect(await script(SERIAL)).not.toEqual(await script('K5A-2648-00043'));
  });

  it('models an unknown part from ratings given with UUT:RAT', async () => {
    const f = fixture();
    await f.send('UUT:SER "ZZ-0001","ZZ-PART","L9"');
    expect((await f.errors())[0]).toMatch(/^-224,.*ZZ-PART is not in the fixture's catalogue.*UUT:RAT/);
    await f.send('UUT:RAT 24 V,5 V,2 A');
    await f.send('SOUR:VOLT 24');
    await f.send('OUTP ON');
    expect(Math.abs((await f.num('MEAS:VOLT:OUT?')) / 5 - 1)).toBeLessThan(0.03);
    expect(await f.errors()).toEqual([]);
  });
});

describe('defective units through the protocol', () => {
  const withCondition = (condition: string) => fixture({ config: { serials: { [SERIAL]: condition as never } } });

  it('open_output reads no output under load', async () => {
    const f = withCondition('open_output');
    await powerUp(f);
    await f.send('LOAD:CURR 3');
    await f.send('LOAD ON');
    expect(Math.abs(await f.num('MEAS:VOLT:OUT?'))).toBeLessThan(2e-3);
    expect((await f.send('PROT:TEST? 6'))!.split(',').slice(0, 2)).toEqual(['1', '0']);
  });

  it('wrong_feedback reads 6–10 % off nominal', async () => {
    const f = withCondition('wrong_feedback');
    await powerUp(f);
    const offset = Math.abs((await f.num('MEAS:VOLT:OUT?')) / 5 - 1);
    expect(offset).toBeGreaterThan(0.055);
    expect(offset).toBeLessThan(0.105);
  });

  it('no_protection does not fold back', async () => {
    const f = withCondition('no_protection');
    await powerUp(f);
    expect((await f.send('PROT:TEST? 6'))!.split(',').slice(0, 2)).toEqual(['0', '1']);
  });

  it('weak_switch runs hot at full load', async () => {
    const f = withCondition('weak_switch');
    await powerUp(f);
    await f.send('LOAD:CURR 3');
    await f.send('LOAD ON');
    expect(await f.num('MEAS:TEMP?')).toBeGreaterThan(70);
    expect(await f.send('MEAS:TEMP:HOT?')).toBe('1');
  });

  it('intermittent_contact makes readings noisy and sometimes drops or garbles a reply', async () => {
    const f = withCondition('intermittent_contact');
    await powerUp(f);
    const replies: Array<string | null> = [];
    for (let i = 0; i < 300; i++) replies.push(await f.send('MEAS:VOLT:OUT?'));
    const dropped = replies.filter((r) => r === null).length;
    const garbled = replies.filter((r) => r !== null && !/^[+-]\d\.\d{5}E[+-]\d{2}$/.test(r)).length;
    // expected 5 % each of 300 = 15; binomial sd ≈ 3.8
    expect(dropped).toBeGreaterThan(3);
    expect(garbled).toBeGreaterThan(3);
    const values = replies.filter((r): r is string => r !== null && /^[+-]\d\.\d{5}E[+-]\d{2}$/.test(r)).map(Number);
    const mean = values.reduce((a, b) => a + b, 0) / values.length;
    const sd = Math.sqrt(values.reduce((a, b) => a + (b - mean) ** 2, 0) / (values.length - 1));
    expect(sd * 1000).toBeGreaterThan(5);
    // housekeeping queries still answer
    expect(await f.send('*IDN?')).toMatch(/^RAILWRIGHT/);
  });
});

describe('timing', () => {
  function timed(timing: 'realistic' | 'instant') {
    const sleeps: number[] = [];
    const f = fixture({
      timing,
      sleep: async (ms) => {
        sleeps.push(ms);
      },
    });
    return { ...f, sleeps };
  }

  it('waits for settling, readings, captures and the overload test when realistic', async () => {
    const f = timed('realistic');
    await powerUp(f);
    // the *OPC? after OUTP ON waited for what was left of the 80 ms soft start
    expect(f.sleeps).toHaveLength(1);
    expect(f.sleeps[0]).toBeGreaterThan(REALISTIC_TIMING.sourceOnSettleMs - 30);
    expect(f.sleeps[0]).toBeLessThanOrEqual(REALISTIC_TIMING.sourceOnSettleMs);
    f.sleeps.length = 0;
    await f.send('MEAS:VOLT:OUT?');
    await f.send('CAPT:INIT');
    await f.send('PROT:TEST? 6');
    await f.send('*OPC?');
    // 1000 points at 5 MHz take 0.2 ms on top of the 100 ms overhead
    expect(f.sleeps).toEqual([REALISTIC_TIMING.measureMs, REALISTIC_TIMING.captureMs + 0.2, REALISTIC_TIMING.protectionTestMs]);
  });

  it('never waits when instant', async () => {
    const f = timed('instant');
    await powerUp(f);
    await f.send('MEAS:VOLT:OUT?');
    await f.send('CAPT:INIT');
    await f.send('PROT:TEST? 6');
    expect(f.sleeps).toEqual([]);
  });

  it('spends a few seconds on a whole unit when realistic', async () => {
    const f = timed('realistic');
    // a plan of the shape of docs/architecture.md: ~9 steps, ~25 readings, 2 captures, 1 overload test;
    // each settle is counted in full as if the client sent *OPC? at once
    let total = 0;
    const count = () => {
      total += f.sleeps.reduce((a, b) => a + b, 0);
      f.sleeps.length = 0;
    };
    await powerUp(f);
    count();
    for (let i = 0; i < 25; i++) await f.send('MEAS:VOLT:OUT?');
    for (let i = 0; i < 8; i++) total += REALISTIC_TIMING.loadChangeSettleMs;
    await f.send('CAPT:INIT');
    await f.send('CAPT:INIT');
    await f.send('PROT:TEST? 6');
    count();
    expect(total).toBeGreaterThan(1000);
    expect(total).toBeLessThan(10_000);
  });
});
