import { DEFAULT_SIMULATOR_CONFIG, defectFor, validateSimulatorConfig, type SimulatorConfig } from '../defects';
import { captureOutputRecord } from '../physics/capture';
import type { ProductModel } from '../physics/model-types';
import { solveOperatingPoint, type OperatingPoint } from '../physics/operating-point';
import { RandomStream } from '../physics/prng';
import { protectionTest } from '../physics/protection';
import { findProduct, genericProduct, type GenericRatings } from '../products';
import { modelUnit, type SimulatedUnit } from '../unit-model';
import {
  ErrorQueue,
  SCPI_NAN,
  ScpiError,
  formatErrorReply,
  formatNr3,
  nodeMatches,
  parseBoolean,
  parseLine,
  parseNumber,
  type ParsedLine,
} from './scpi';

/** Firmware string the simulator reports in `*IDN?`. */
export const SIMULATOR_FIRMWARE = '0.1.0';

/** Limits of the simulated instruments; outside them a setting is refused with -222. */
export const FIXTURE_LIMITS = Object.freeze({
  sourceMaxV: 60,
  loadMaxA: 10,
  captureMinRateHz: 1e3,
  captureMaxRateHz: 100e6,
  captureMinPoints: 10,
  captureMaxPoints: 100_000,
  maxLineChars: 4096,
});

/**
 * Waits in `realistic` timing, in milliseconds. Chosen so a whole unit takes a few seconds, like a bench
 * fixture with a programmable source, an electronic load and a digitiser (common practice, no source).
 */
export const REALISTIC_TIMING = Object.freeze({
  /** source switched on: source slew plus the module's soft start */
  sourceOnSettleMs: 80,
  /** source switched off or its voltage changed while on */
  sourceChangeSettleMs: 40,
  /** load switched or its current changed while on: load slew plus the module's loop recovery */
  loadChangeSettleMs: 50,
  /** one DC reading: one 50 Hz power-line cycle of integration plus an auto-zero cycle */
  measureMs: 40,
  /** capture set-up and transfer overhead, on top of the record's own duration */
  captureMs: 100,
  /** overload applied, held, released and the output watched */
  protectionTestMs: 300,
});

/** Capture defaults after power-up and `*RST`. */
export const CAPTURE_DEFAULTS = Object.freeze({ rateHz: 5e6, points: 1000 });

/** Meter noise (1 σ) of the simulated instruments: offset plus a fraction of the reading (common practice, no source). */
const NOISE = Object.freeze({
  vinV: { offset: 1e-3, relative: 50e-6 },
  iinA: { offset: 20e-6, relative: 200e-6 },
  voutV: { offset: 150e-6, relative: 20e-6 },
  ioutA: { offset: 0.5e-3, relative: 200e-6 },
  tempC: { offset: 0.3, relative: 0 },
  captureVrms: 0.5e-3,
});

/** How badly an intermittent contact behaves (modelling choice, no source). */
const CONTACT_FAULT = Object.freeze({
  noiseFactor: 40,
  /** chance that a reading query gets no reply at all */
  dropRate: 0.05,
  /** chance that a reading query gets a garbled line */
  garbleRate: 0.05,
  /** a reading loses up to this fraction through the contact's resistance */
  maxLossFraction: 0.02,
});

/** Case temperature above which `MEAS:TEMP:HOT?` reports 1 (a module that runs hot; common practice, no source). */
export const HOT_THRESHOLD_C = 70;

export interface FixtureSimulatorOptions {
  /** Reported in `*IDN?`; letters, digits, '-', '_' and '.' only */
  fixtureId: string;
  /** `realistic` waits like hardware; `instant` never waits (benchmarks, seeding) */
  timing: 'realistic' | 'instant';
  /** Where defects go; defaults to {@link DEFAULT_SIMULATOR_CONFIG}. Validated here. */
  config?: SimulatorConfig;
  /** Extra or replacement products, full models or ratings only (a generic design is built) */
  products?: Record<string, ProductModel | GenericRatings>;
  /** Unit modelled until the first `UUT:SER` (the standalone fixture uses this) */
  defaultUnit?: { partNumber: string; serial?: string; lotCode?: string };
  /** Replaces the timer, for tests */
  sleep?: (ms: number) => Promise<void>;
}

/** What the simulator is doing, for tests and logs. */
export interface FixtureState {
  sourceOn: boolean;
  sourceV: number;
  loadOn: boolean;
  loadA: number;
  captureRateHz: number;
  capturePoints: number;
  step: { fromA: number; toA: number } | null;
  unit: { serial: string; partNumber: string; lotCode: string; condition: string } | null;
  errors: number;
}

type ArgList = ParsedLine['args'];
interface Handler {
  /** Header mnemonics; nodes in [brackets] may be left out */
  pattern: string;
  query: boolean;
  /** Reading queries of the unit (noise, contact faults apply) */
  reading?: boolean;
  run(args: ArgList): Promise<string | void> | string | void;
}

const FIXTURE_ID_RE = /^[A-Za-z0-9._-]{1,32}$/;

/**
 * The simulated end-of-line fixture: a programmable input source, an electronic load, DC meters, an output
 * digitiser and an overload tester around one modelled buck module. Speaks the line protocol of
 * docs/fixture-protocol.md one line at a time.
 */
export class FixtureSimulator {
  readonly fixtureId: string;
  readonly timing: 'realistic' | 'instant';
  private readonly config: SimulatorConfig;
  private readonly products: Record<string, ProductModel | GenericRatings>;
  private readonly sleepFn: (ms: number) => Promise<void>;
  private readonly errors = new ErrorQueue(10);
  private readonly handlers: Array<Handler & { alternatives: string[][] }>;
  private chain: Promise<unknown> = Promise.resolve();

  private sourceOn = false;
  private sourceV = 0;
  private loadOn = false;
  private loadA = 0;
  private captureRateHz: number = CAPTURE_DEFAULTS.rateHz;
  private capturePoints: number = CAPTURE_DEFAULTS.points;
  private step: { fromA: number; toA: number } | null = null;
  private record: number[] | null = null;
  private settleUntilMs = 0;

  private identity: { serial: string; partNumber: string; lotCode: string } | null = null;
  private unit: SimulatedUnit | null = null;
  private noise: RandomStream;
  private lastSafeReason: string | null = null;

  constructor(options: FixtureSimulatorOptions) {
    if (!options || typeof options.fixtureId !== 'string' || !FIXTURE_ID_RE.test(options.fixtureId)) {
      throw new TypeError(
        `fixtureId must be 1–32 letters, digits, ".", "_" or "-" (it appears in *IDN? replies), got ${JSON.stringify(options?.fixtureId)}`,
      );
    }
    if (options.timing !== 'realistic' && options.timing !== 'instant') {
      throw new TypeError(`timing must be "realistic" or "instant", got ${JSON.stringify(options.timing)}`);
    }
    this.fixtureId = options.fixtureId;
    this.timing = options.timing;
    this.config = options.config === undefined ? DEFAULT_SIMULATOR_CONFIG : validateSimulatorConfig(options.config);
    this.products = { ...(options.products ?? {}) };
    this.sleepFn = options.sleep ?? ((ms) => new Promise((resolve) => setTimeout(resolve, ms)));
    this.noise = new RandomStream(`noise|${this.fixtureId}`);
    this.handlers = this.buildHandlers().map((h) => ({ ...h, alternatives: expandPattern(h.pattern) }));
    if (options.defaultUnit) {
      const part = options.defaultUnit.partNumber;
      if (!findProduct(part, this.products)) {
        throw new TypeError(`defaultUnit.partNumber ${JSON.stringify(part)} is not a known product (known: ${this.knownParts().join(', ')})`);
      }
      this.clampUnit({
        serial: options.defaultUnit.serial ?? 'SIM-0000-00000',
        partNumber: part,
        lotCode: options.defaultUnit.lotCode ?? 'SIM-LOT',
      });
    }
  }

  /**
   * Process one command line and return the reply line (without its newline), or null when the command
   * produces no reply. Lines are handled strictly in the order of the calls.
   */
  handleLine(line: string): Promise<string | null> {
    const result = this.chain.then(() => this.process(line));
    this.chain = result.catch(() => undefined);
    return result;
  }

  /** Switch source and load off: on link loss, shutdown or any internal fault. */
  enterSafeState(reason: string): void {
    this.sourceOn = false;
    this.loadOn = false;
    this.lastSafeReason = reason;
  }

  /**
   * Queue an error found outside command handling (e.g. by the transport: an over-long line that had to be
   * discarded), so that it is reported through `SYST:ERR?` rather than lost.
   */
  reportError(code: number, detail: string): void {
    this.errors.push(code, detail);
  }

  /** Why the fixture last went to its safe state, if it did. */
  get safeStateReason(): string | null {
    return this.lastSafeReason;
  }

  /** A snapshot of the settings and the clamped unit. */
  state(): FixtureState {
    return {
      sourceOn: this.sourceOn,
      sourceV: this.sourceV,
      loadOn: this.loadOn,
      loadA: this.loadA,
      captureRateHz: this.captureRateHz,
      capturePoints: this.capturePoints,
      step: this.step ? { ...this.step } : null,
      unit: this.unit ? { ...this.unit.identity, condition: this.unit.condition } : null,
      errors: this.errors.count,
    };
  }

  /** The modelled unit's present steady state (no meter noise), or null when no unit is modelled. */
  operatingPoint(): OperatingPoint | null {
    return this.unit ? solveOperatingPoint(this.unit.model, this.conditions()) : null;
  }

  private knownParts(): string[] {
    return [...new Set([...Object.keys(this.products), 'OB-BK0503', 'OB-BK3305', 'OB-BK1202'])];
  }

  private async process(rawLine: string): Promise<string | null> {
    const line = rawLine.replace(/\r?\n$/, '').replace(/\r$/, '');
    if (line.trim() === '') return null;
    let parsed: ParsedLine | null = null;
    try {
      if (line.length > FIXTURE_LIMITS.maxLineChars) {
        throw new ScpiError(-223, `line of ${line.length} characters; the fixture takes at most ${FIXTURE_LIMITS.maxLineChars}`);
      }
      if (/[^\x20-\x7e\t]/.test(line)) throw new ScpiError(-102, 'the line holds a non-printable or non-ASCII character');
      parsed = parseLine(line);
      const handler = this.findHandler(parsed);
      const reply = await handler.run(parsed.args);
      if (!parsed.query) return null;
      const text = reply ?? formatNr3(SCPI_NAN);
      return handler.reading ? this.throughContact(text) : text;
    } catch (error) {
      if (error instanceof ScpiError) {
        this.errors.push(error.code, error.detail);
      } else {
        // anything unexpected: make the fixture safe before anything else
        const message = error instanceof Error ? error.message : String(error);
        this.enterSafeState(`internal fault: ${message}`);
        this.errors.push(-300, `internal fault, source and load switched off: ${message}`);
      }
      // a query always gets one line, so the client's replies stay in step; the reason is in SYST:ERR?
      const isQuery = parsed ? parsed.query : /^\S*\?(\s|$)/.test(line.trim());
      return isQuery ? formatNr3(SCPI_NAN) : null;
    }
  }

  private findHandler(parsed: ParsedLine): Handler {
    const candidates = this.handlers.filter((h) =>
      h.alternatives.some((alt) => alt.length === parsed.nodes.length && alt.every((m, i) => nodeMatches(parsed.nodes[i], m))),
    );
    if (candidates.length === 0) {
      throw new ScpiError(-113, `${parsed.headerText} is not a command of this fixture (see docs/fixture-protocol.md)`);
    }
    const handler = candidates.find((h) => h.query === parsed.query);
    if (!handler) {
      throw new ScpiError(
        -113,
        parsed.query ? `${parsed.headerText} has no query form` : `${parsed.headerText} is a query only; add ?`,
      );
    }
    return handler;
  }

  private conditions() {
    return { sourceOn: this.sourceOn, vinV: this.sourceV, loadA: this.loadOn ? this.loadA : 0 };
  }

  private async wait(ms: number): Promise<void> {
    if (this.timing === 'instant' || ms <= 0) return;
    await this.sleepFn(ms);
  }

  private settleFor(ms: number): void {
    if (this.timing === 'instant') return;
    this.settleUntilMs = Math.max(this.settleUntilMs, Date.now() + ms);
  }

  private clampUnit(identity: { serial: string; partNumber: string; lotCode: string }, product?: ProductModel): void {
    this.identity = identity;
    this.record = null;
    this.noise = new RandomStream(`noise|${this.fixtureId}|${identity.serial}`);
    const model = product ?? findProduct(identity.partNumber, this.products);
    this.unit = model ? modelUnit(identity, model, defectFor(identity.serial, identity.lotCode, this.config)) : null;
  }

  private meter(value: number, spec: { offset: number; relative: number }): number {
    const contact = this.unit?.condition === 'intermittent_contact';
    const sigma = (spec.offset + spec.relative * Math.abs(value)) * (contact ? CONTACT_FAULT.noiseFactor : 1);
    const loss = contact ? this.noise.uniform() * CONTACT_FAULT.maxLossFraction * value : 0;
    return value - loss + sigma * this.noise.normal();
  }

  /** Output-side readings only mean something with the source on and a unit modelled. */
  private outputSideConflict(what: string): void {
    if (!this.sourceOn) this.errors.push(-221, `${what} with the input source off reads nothing; send OUTP ON first`);
    else if (!this.unit) this.errors.push(-221, `${what}: no unit is modelled; send UUT:SER with a known part (or UUT:RAT)`);
  }

  /** An intermittent contact sometimes swallows or mangles a reading's reply. */
  private throughContact(reply: string): string | null {
    if (this.unit?.condition !== 'intermittent_contact') return reply;
    const u = this.noise.uniform();
    if (u < CONTACT_FAULT.dropRate) return null;
    if (u < CONTACT_FAULT.dropRate + CONTACT_FAULT.garbleRate) {
      const chars = reply.split('');
      const count = 1 + Math.floor(this.noise.uniform() * 3);
      for (let k = 0; k < count; k++) {
        chars[Math.floor(this.noise.uniform() * chars.length)] = '#?~%'[Math.floor(this.noise.uniform() * 4)];
      }
      return chars.slice(0, Math.max(1, chars.length - Math.floor(this.noise.uniform() * 4))).join('');
    }
    return reply;
  }

  private expectArgs(args: ArgList, count: number, usage: string): void {
    if (args.length < count) throw new ScpiError(-109, `expected ${usage}`);
    if (args.length > count) throw new ScpiError(-108, `too many arguments; expected ${usage}`);
  }

  private buildHandlers(): Handler[] {
    const noArgs = (args: ArgList, header: string) => {
      if (args.length > 0) throw new ScpiError(-108, `${header} takes no arguments`);
    };
    const reading = (pattern: string, header: string, read: (op: OperatingPoint | null) => string, outputSide: boolean): Handler => ({
      pattern,
      query: true,
      reading: true,
      run: async (args) => {
        noArgs(args, header);
        await this.wait(REALISTIC_TIMING.measureMs);
        if (outputSide) this.outputSideConflict(header);
        return read(this.operatingPoint());
      },
    });

    return [
      {
        pattern: '*IDN',
        query: true,
        run: (args) => {
          noArgs(args, '*IDN?');
          return `RAILWRIGHT,SIM-FIXTURE,${this.fixtureId},${SIMULATOR_FIRMWARE}`;
        },
      },
      {
        pattern: '*RST',
        query: false,
        run: (args) => {
          noArgs(args, '*RST');
          if (this.sourceOn || this.loadOn) this.settleFor(REALISTIC_TIMING.sourceChangeSettleMs);
          this.sourceOn = false;
          this.loadOn = false;
          this.sourceV = 0;
          this.loadA = 0;
          this.captureRateHz = CAPTURE_DEFAULTS.rateHz;
          this.capturePoints = CAPTURE_DEFAULTS.points;
          this.step = null;
          this.record = null;
        },
      },
      {
        pattern: '*CLS',
        query: false,
        run: (args) => {
          noArgs(args, '*CLS');
          this.errors.clear();
        },
      },
      {
        pattern: '*OPC',
        query: true,
        run: async (args) => {
          noArgs(args, '*OPC?');
          const remainingMs = this.settleUntilMs - Date.now();
          this.settleUntilMs = 0;
          await this.wait(remainingMs);
          return '1';
        },
      },
      {
        pattern: '*OPC',
        query: false,
        // operations complete before the next command is read, so setting the OPC bit has nothing to wait for
        run: (args) => noArgs(args, '*OPC'),
      },
      {
        pattern: 'SYSTem:ERRor[:NEXT]',
        query: true,
        run: (args) => {
          noArgs(args, 'SYST:ERR?');
          return formatErrorReply(this.errors.pop());
        },
      },
      {
        pattern: 'SYSTem:ERRor:COUNt',
        query: true,
        run: (args) => {
          noArgs(args, 'SYST:ERR:COUN?');
          return String(this.errors.count);
        },
      },
      {
        pattern: 'UUT:SERial',
        query: false,
        run: (args) => {
          this.expectArgs(args, 3, 'UUT:SER "<serial>","<part number>","<lot code>"');
          const [serial, partNumber, lotCode] = args.map((a) => a.text);
          for (const [name, value] of [['serial', serial], ['part number', partNumber], ['lot code', lotCode]]) {
            if (value.length === 0 || value.length > 40 || !/^[\x21-\x7e]+$/.test(value)) {
              throw new ScpiError(-224, `${name} must be 1–40 printable characters without spaces, got '${value}'`);
            }
          }
          this.clampUnit({ serial, partNumber, lotCode });
          if (!this.unit) {
            throw new ScpiError(
              -224,
              `part ${partNumber} is not in the fixture's catalogue (${this.knownParts().join(', ')}); send UUT:RAT <vin nominal V>,<vout V>,<iout A> to model it`,
            );
          }
        },
      },
      {
        pattern: 'UUT:SERial',
        query: true,
        run: (args) => {
          noArgs(args, 'UUT:SER?');
          const id = this.identity;
          const quote = (s: string) => `"${s.replace(/"/g, '""')}"`;
          return id ? [id.serial, id.partNumber, id.lotCode].map(quote).join(',') : '"","",""';
        },
      },
      {
        pattern: 'UUT:RATings',
        query: false,
        run: (args) => {
          this.expectArgs(args, 3, 'UUT:RAT <vin nominal V>,<vout V>,<iout A>');
          if (!this.identity) throw new ScpiError(-221, 'send UUT:SER before UUT:RAT, so the ratings belong to a unit');
          const vinNomV = parseNumber(args[0], 'V', 'nominal input');
          const voutV = parseNumber(args[1], 'V', 'output voltage');
          const ioutRatedA = parseNumber(args[2], 'A', 'rated current');
          if (vinNomV <= 0 || vinNomV > FIXTURE_LIMITS.sourceMaxV) throw new ScpiError(-222, `nominal input must be above 0 and at most ${FIXTURE_LIMITS.sourceMaxV} V`);
          if (ioutRatedA <= 0 || ioutRatedA > FIXTURE_LIMITS.loadMaxA) throw new ScpiError(-222, `rated current must be above 0 and at most ${FIXTURE_LIMITS.loadMaxA} A`);
          let product: ProductModel;
          try {
            product = genericProduct({ partNumber: this.identity.partNumber, vinNomV, voutV, ioutRatedA });
          } catch (error) {
            throw new ScpiError(-224, error instanceof Error ? error.message : String(error));
          }
          this.products[this.identity.partNumber] = product;
          this.clampUnit(this.identity, product);
        },
      },
      {
        pattern: 'SOURce:VOLTage[:LEVel]',
        query: false,
        run: (args) => {
          this.expectArgs(args, 1, 'SOUR:VOLT <volts>');
          const v = parseNumber(args[0], 'V', 'source voltage');
          if (v < 0 || v > FIXTURE_LIMITS.sourceMaxV) {
            throw new ScpiError(-222, `source voltage ${v} V is outside 0 to ${FIXTURE_LIMITS.sourceMaxV} V`);
          }
          if (this.sourceOn && v !== this.sourceV) this.settleFor(REALISTIC_TIMING.sourceChangeSettleMs);
          this.sourceV = v;
        },
      },
      { pattern: 'SOURce:VOLTage[:LEVel]', query: true, run: () => formatNr3(this.sourceV) },
      {
        pattern: 'OUTPut[:STATe]',
        query: false,
        run: (args) => {
          this.expectArgs(args, 1, 'OUTP ON|OFF');
          const on = parseBoolean(args[0], 'OUTP');
          if (on !== this.sourceOn) this.settleFor(on ? REALISTIC_TIMING.sourceOnSettleMs : REALISTIC_TIMING.sourceChangeSettleMs);
          this.sourceOn = on;
        },
      },
      { pattern: 'OUTPut[:STATe]', query: true, run: () => (this.sourceOn ? '1' : '0') },
      {
        pattern: 'LOAD:CURRent[:LEVel]',
        query: false,
        run: (args) => {
          this.expectArgs(args, 1, 'LOAD:CURR <amperes>');
          const a = parseNumber(args[0], 'A', 'load current');
          if (a < 0 || a > FIXTURE_LIMITS.loadMaxA) {
            throw new ScpiError(-222, `load current ${a} A is outside 0 to ${FIXTURE_LIMITS.loadMaxA} A`);
          }
          if (this.loadOn && a !== this.loadA) this.settleFor(REALISTIC_TIMING.loadChangeSettleMs);
          this.loadA = a;
        },
      },
      { pattern: 'LOAD:CURRent[:LEVel]', query: true, run: () => formatNr3(this.loadA) },
      {
        pattern: 'LOAD[:STATe]',
        query: false,
        run: (args) => {
          this.expectArgs(args, 1, 'LOAD ON|OFF');
          const on = parseBoolean(args[0], 'LOAD');
          if (on !== this.loadOn) this.settleFor(REALISTIC_TIMING.loadChangeSettleMs);
          this.loadOn = on;
        },
      },
      { pattern: 'LOAD[:STATe]', query: true, run: () => (this.loadOn ? '1' : '0') },
      reading('MEASure:VOLTage:INput', 'MEAS:VOLT:IN?', (_op) => formatNr3(this.meter(this.sourceOn ? this.sourceV : 0, NOISE.vinV)), false),
      reading('MEASure:CURRent:INput', 'MEAS:CURR:IN?', (op) => formatNr3(this.meter(op?.iinA ?? 0, NOISE.iinA)), false),
      reading('MEASure:VOLTage:OUTput', 'MEAS:VOLT:OUT?', (op) => formatNr3(this.meter(op?.voutV ?? 0, NOISE.voutV)), true),
      reading('MEASure:CURRent:OUTput', 'MEAS:CURR:OUT?', (op) => formatNr3(this.meter(op?.ioutA ?? 0, NOISE.ioutA)), true),
      reading('MEASure:TEMPerature', 'MEAS:TEMP?', (op) => formatNr3(this.meter(op?.caseTempC ?? 25, NOISE.tempC)), false),
      reading('MEASure:TEMPerature:HOT', 'MEAS:TEMP:HOT?', (op) => ((op?.caseTempC ?? 25) > HOT_THRESHOLD_C ? '1' : '0'), false),
      {
        pattern: 'CAPTure:RATE',
        query: false,
        run: (args) => {
          this.expectArgs(args, 1, 'CAPT:RATE <hertz>');
          const hz = parseNumber(args[0], 'HZ', 'capture rate');
          if (hz < FIXTURE_LIMITS.captureMinRateHz || hz > FIXTURE_LIMITS.captureMaxRateHz) {
            throw new ScpiError(-222, `capture rate ${hz} Hz is outside ${FIXTURE_LIMITS.captureMinRateHz} to ${FIXTURE_LIMITS.captureMaxRateHz} Hz`);
          }
          this.captureRateHz = hz;
        },
      },
      { pattern: 'CAPTure:RATE', query: true, run: () => formatNr3(this.captureRateHz) },
      {
        pattern: 'CAPTure:POINts',
        query: false,
        run: (args) => {
          this.expectArgs(args, 1, 'CAPT:POIN <count>');
          const n = parseNumber(args[0], 'none', 'point count');
          if (!Number.isInteger(n) || n < FIXTURE_LIMITS.captureMinPoints || n > FIXTURE_LIMITS.captureMaxPoints) {
            throw new ScpiError(-222, `point count must be a whole number from ${FIXTURE_LIMITS.captureMinPoints} to ${FIXTURE_LIMITS.captureMaxPoints}, got ${args[0].text}`);
          }
          this.capturePoints = n;
        },
      },
      { pattern: 'CAPTure:POINts', query: true, run: () => String(this.capturePoints) },
      {
        pattern: 'CAPTure:STEP',
        query: false,
        run: (args) => {
          if (args.length === 1 && !args[0].quoted && args[0].text.toUpperCase() === 'OFF') {
            this.step = null;
            return;
          }
          this.expectArgs(args, 2, 'CAPT:STEP <from A>,<to A> or CAPT:STEP OFF');
          const fromA = parseNumber(args[0], 'A', 'step start current');
          const toA = parseNumber(args[1], 'A', 'step end current');
          for (const a of [fromA, toA]) {
            if (a < 0 || a > FIXTURE_LIMITS.loadMaxA) throw new ScpiError(-222, `step current ${a} A is outside 0 to ${FIXTURE_LIMITS.loadMaxA} A`);
          }
          if (fromA === toA) throw new ScpiError(-224, `a load step needs two different currents, got ${fromA} A twice`);
          this.step = { fromA, toA };
        },
      },
      {
        pattern: 'CAPTure:STEP',
        query: true,
        run: (args) => {
          noArgs(args, 'CAPT:STEP?');
          return this.step ? `${formatNr3(this.step.fromA)},${formatNr3(this.step.toA)}` : 'OFF';
        },
      },
      {
        pattern: 'CAPTure:INITiate',
        query: false,
        run: async (args) => {
          noArgs(args, 'CAPT:INIT');
          await this.wait(REALISTIC_TIMING.captureMs + (1000 * this.capturePoints) / this.captureRateHz);
          this.outputSideConflict('CAPT:INIT');
          const contact = this.unit?.condition === 'intermittent_contact';
          this.record = captureOutputRecord({
            unit: this.unit?.model ?? null,
            sourceOn: this.sourceOn,
            vinV: this.sourceV,
            loadA: this.loadOn ? this.loadA : 0,
            step: this.step,
            rateHz: this.captureRateHz,
            points: this.capturePoints,
            noiseVrms: NOISE.captureVrms * (contact ? CONTACT_FAULT.noiseFactor / 4 : 1),
            rng: this.noise,
          });
        },
      },
      {
        pattern: 'CAPTure:DATA',
        query: true,
        reading: true,
        run: (args) => {
          noArgs(args, 'CAPT:DATA?');
          if (!this.record) throw new ScpiError(-230, 'no record has been taken since power-up, *RST or UUT:SER; send CAPT:INIT first');
          return this.record.map(formatNr3).join(',');
        },
      },
      {
        pattern: 'PROTection:TEST',
        query: true,
        reading: true,
        run: async (args) => {
          this.expectArgs(args, 1, 'PROT:TEST? <overload A>');
          const overloadA = parseNumber(args[0], 'A', 'overload current');
          if (overloadA <= 0 || overloadA > FIXTURE_LIMITS.loadMaxA) {
            throw new ScpiError(-222, `overload current ${overloadA} A is outside 0 (exclusive) to ${FIXTURE_LIMITS.loadMaxA} A`);
          }
          await this.wait(REALISTIC_TIMING.protectionTestMs);
          this.outputSideConflict('PROT:TEST?');
          if (!this.sourceOn || !this.unit) return `0,0,${formatNr3(this.meter(0, NOISE.voutV))},${formatNr3(this.meter(0, NOISE.voutV))}`;
          const result = protectionTest(this.unit.model, this.sourceV, this.loadOn ? this.loadA : 0, overloadA);
          return [
            result.folded ? '1' : '0',
            result.recovered ? '1' : '0',
            formatNr3(this.meter(result.voutDuringV, NOISE.voutV)),
            formatNr3(this.meter(result.voutAfterV, NOISE.voutV)),
          ].join(',');
        },
      },
    ];
  }
}

/** Expand a pattern with optional [nodes] into every accepted node sequence. */
function expandPattern(pattern: string): string[][] {
  const parts = pattern.split(/(?=\[:)|(?<=\])/).filter(Boolean);
  let results: string[][] = [[]];
  for (const part of parts) {
    const optional = part.startsWith('[');
    const nodes = part.replace(/^\[?:?/, '').replace(/\]$/, '').split(':').filter(Boolean);
    const extended = results.map((r) => [...r, ...nodes]);
    results = optional ? [...results, ...extended] : extended;
  }
  return results;
}

