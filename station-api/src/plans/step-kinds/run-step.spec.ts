import { EventEmitter } from 'node:events';
import { describe, expect, it } from 'vitest';
import type { FixtureTransport, RequestOptions } from '../../fixtures/transport/fixture-transport';
import { ScpiClient } from '../../fixtures/transport/scpi-client';
import type { PlanStep } from '../plan-definition';
import { parseLimitKey, quantityFor, runStep, stepProblems, type StepContext } from './index';

/** A scripted module: readings are functions of what the fixture has set. */
class ScriptedFixture extends EventEmitter implements FixtureTransport {
  readonly path = 'scripted';
  isOpen = true;
  generation = 1;
  sent: string[] = [];
  state = { vinV: 0, on: false, loadA: 0, loadOn: false };
  constructor(private readonly readings: Partial<Record<string, (s: ScriptedFixture['state']) => string>>) {
    super();
  }
  async open() {}
  async close() {}
  async request(line: string, o: RequestOptions): Promise<string | undefined> {
    this.sent.push(line);
    const [head, arg] = line.split(' ');
    if (head === 'SOUR:VOLT') this.state.vinV = Number(arg);
    if (head === 'OUTP') this.state.on = arg === 'ON';
    if (head === 'LOAD:CURR') this.state.loadA = Number(arg);
    if (head === 'LOAD') this.state.loadOn = arg === 'ON';
    if (!o.expectReply) return undefined;
    if (head === '*OPC?') return '1';
    const f = this.readings[head];
    if (!f) throw new Error(`no scripted reply for ${line}`);
    return f(this.state);
  }
}

const product = { partNumber: 'OB-BK0503', vinMinV: 9, vinNomV: 12, vinMaxV: 18, voutNomV: 5, ioutRatedA: 3 };

function ctxFor(fx: ScriptedFixture): StepContext {
  return { scpi: new ScpiClient(fx, { fixtureCode: 'FX-101', timeoutMs: 100 }), product, settle: async () => undefined, fixture: {} };
}

const step = (kind: PlanStep['kind'], params: PlanStep['params'], limits: PlanStep['limits'] = []): PlanStep => ({ key: kind, name: kind, kind, params, limits });

describe('runStep', () => {
  it('reads the no-load input current in mA with the load off and the source at nominal', async () => {
    const fx = new ScriptedFixture({ 'MEAS:CURR:IN?': () => '0.0123' });
    const [q] = await runStep(step('input_current_no_load', {}), ctxFor(fx));
    expect(q.base).toBe('iinNoLoadMa');
    expect(q.value).toBeCloseTo(12.3, 12);
    expect(fx.sent).toEqual(['LOAD OFF', 'SOUR:VOLT 12', 'OUTP ON', '*OPC?', 'MEAS:CURR:IN?']);
  });

  it('computes efficiency per load from the four DC readings', async () => {
    // η = Pout/Pin, self-constructed example: 12.000 V, 0.9500 A in; 5.000 V, 2.000 A out → η = 10/11.4 = 87.7192982456 %
    const fx = new ScriptedFixture({
      'MEAS:VOLT:IN?': () => '12.000',
      'MEAS:CURR:IN?': () => '0.9500',
      'MEAS:VOLT:OUT?': () => '5.000',
      'MEAS:CURR:OUT?': () => '2.000',
    });
    const qs = await runStep(step('efficiency', { loadsA: [2] }), ctxFor(fx));
    expect(qs).toHaveLength(1);
    expect(qs[0]).toMatchObject({ base: 'efficiencyPct', atA: 2 });
    expect(qs[0].value).toBeCloseTo(87.7192982456, 9);
    expect(qs[0].raw).toMatchObject({ vinV: 12, iinA: 0.95, voutV: 5, ioutA: 2 });
  });

  it('computes load regulation by the plan definition from V at 0 A, half and full load', async () => {
    // self-constructed example (definitions in docs/reference.md): V_NL 5.050, V_FL 4.990 at 3.0 A, V_nom 5.000, V(50 %) 5.020
    const vAt = (s: { loadA: number; loadOn: boolean }) => (!s.loadOn ? '5.050' : s.loadA === 3 ? '4.990' : '5.020');
    const nominal = await runStep(step('load_regulation', { regulationDefinition: 'nominal' }), ctxFor(new ScriptedFixture({ 'MEAS:VOLT:OUT?': vAt })));
    expect(nominal[0].value).toBeCloseTo(1.2, 12); // LR2 ÷ V_nom = 1.200000000 %
    const full = await runStep(step('load_regulation', { regulationDefinition: 'full_load' }), ctxFor(new ScriptedFixture({ 'MEAS:VOLT:OUT?': vAt })));
    expect(full[0].value).toBeCloseTo(1.20240481, 8); // LR1 ÷ V_FL = 1.202404810 %
    const ref = await runStep(step('load_regulation', { regulationDefinition: 'reference_load' }), ctxFor(new ScriptedFixture({ 'MEAS:VOLT:OUT?': vAt })));
    expect(ref[0].value).toBeCloseTo(0.597609562, 8); // LR4 vs 5.020 V = 0.597609562 %
  });

  it('sweeps the line at the stated load and takes the nominal-line output as reference', async () => {
    // LN3 (codingace.net line-regulation page): (max − min) / V at nominal line; self-constructed example,
    // outputs 5.010 / 5.000 / 4.995 → 0.015/5.000 = 0.3 %
    const byVin: Record<number, string> = { 9: '5.010', 12: '5.000', 18: '4.995' };
    const fx = new ScriptedFixture({ 'MEAS:VOLT:OUT?': (s) => byVin[s.vinV] });
    const [q] = await runStep(step('line_regulation', { loadA: 1.5 }), ctxFor(fx));
    expect(q.value).toBeCloseTo(0.3, 12);
    expect(fx.sent.filter((l) => l.startsWith('SOUR:VOLT'))).toEqual(['SOUR:VOLT 9', 'SOUR:VOLT 12', 'SOUR:VOLT 18', 'SOUR:VOLT 12']);
  });

  it('turns a reading that admits no value into a value-less quantity with the reason', async () => {
    // no input current read while the output delivers power: efficiency cannot be computed, which must fail, not crash
    const fx = new ScriptedFixture({ 'MEAS:VOLT:IN?': () => '12', 'MEAS:CURR:IN?': () => '0', 'MEAS:VOLT:OUT?': () => '5', 'MEAS:CURR:OUT?': () => '1.5' });
    const [q] = await runStep(step('efficiency', { loadsA: [1.5] }), ctxFor(fx));
    expect(q.value).toBeNull();
    expect(q.problem).toMatch(/input power/);
  });

  it('holds each output reading of a regulation step to the buck range V_out ≤ V_in (Erickson & Maksimović ch. 2, M(D) = D)', async () => {
    // a 5 V module cannot put out 9.5 V from a 9 V input: a swapped meter channel, not a unit to judge
    const byVin: Record<number, string> = { 9: '9.5', 12: '5.000', 18: '4.995' };
    const fx = new ScriptedFixture({ 'MEAS:VOLT:OUT?': (s) => byVin[s.vinV] });
    const [q] = await runStep(step('line_regulation', { loadA: 1.5 }), ctxFor(fx));
    expect(q.implausible).toMatch(/^lineRegPct reading at 9 V in reads 9.5 V, outside its physical range −5 % of V_nom ≤ V_out ≤ V_in/);
  });

  it('reports protection flags as 1 / 0', async () => {
    const fx = new ScriptedFixture({ 'PROT:TEST?': () => '0,1,4.9,5.0' });
    const qs = await runStep(step('protection', { overloadA: 4.5 }), ctxFor(fx));
    expect(qs.map((q) => [q.base, q.value])).toEqual([
      ['foldback', 0],
      ['recovered', 1],
    ]);
  });

  it('finds the step at 20 % of a load-step record and measures against V_nom', async () => {
    // 100 samples at 1 MHz; step at sample 20 (the last pre-step sample); 4.80 V from 21, back to 5.0 V from 31
    const samples = Array.from({ length: 100 }, (_, i) => (i <= 20 ? 5.0 : i <= 30 ? 4.8 : 5.0));
    const fx = new ScriptedFixture({ 'CAPT:DATA?': () => samples.join(',') });
    const qs = await runStep(step('load_step', { fromA: 0.3, toA: 2.7, samples: 100, sampleRateHz: 1e6 }), ctxFor(fx));
    const by = Object.fromEntries(qs.map((q) => [q.base, q.value]));
    expect(by.undershootMv).toBeCloseTo(200, 9);
    expect(by.recoveryUs).toBeGreaterThan(9);
    expect(by.recoveryUs).toBeLessThan(11);
    expect(fx.sent).toContain('CAPT:STEP 0.3,2.7');
  });
});

describe('limit keys', () => {
  it('match loads numerically, with or without the A suffix', () => {
    expect(parseLimitKey('voutV@1.5')).toEqual({ base: 'voutV', atA: 1.5 });
    expect(parseLimitKey('efficiencyPct@1.50A')).toEqual({ base: 'efficiencyPct', atA: 1.5 });
    const qs = [{ base: 'voutV', atA: 1.5, value: 4.99, raw: {} }];
    expect(quantityFor('voutV@1.50A', qs)?.value).toBe(4.99);
    expect(quantityFor('voutV@3', qs)).toBeUndefined();
    expect(quantityFor('voutV', qs)).toBeUndefined();
  });

  it('finds plan problems before power: wrong quantity, load not swept, missing capture settings', () => {
    const s: PlanStep = {
      key: 'eff',
      name: 'Efficiency',
      kind: 'efficiency',
      params: { loadsA: [1.5, 3] },
      limits: [
        { key: 'efficiencyPct@2', name: 'Efficiency', unit: '%', low: 85, rule: 'simple' },
        { key: 'rippleMvPp', name: 'ripple', unit: 'mV', high: 50, rule: 'simple' },
      ],
    };
    const problems = stepProblems(s);
    // the same checks and words as a plan file (plan-steps-check.ts), prefixed with the step
    expect(problems).toContain('step "Efficiency" (eff): limits[0].key: names 2 A, which is not in params.loadsA (1.5, 3)');
    expect(problems.some((p) => p.includes('"rippleMvPp" is not a quantity of a step of kind efficiency'))).toBe(true);
    expect(stepProblems(step('ripple', { loadA: 3 }, [{ key: 'rippleMvPp', name: 'ripple', unit: 'mV', high: 30, rule: 'simple' }]))).toEqual([
      'step "ripple" (ripple): params.samples: is required for a step of kind ripple',
      'step "ripple" (ripple): params.sampleRateHz: is required for a step of kind ripple',
    ]);
  });
});
