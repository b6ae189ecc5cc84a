import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import {
  canonicalJson,
  DEFAULT_PLANS_DIR,
  formatIssue,
  loadAllPlanFiles,
  loadPlanFile,
  parsePlanText,
  PlanFileError,
  type PlanIssue,
  type PlanProduct,
  stepsChecksum,
  validatePlanSteps,
} from './plan-file';

/** The demo plant's products (docs/architecture.md). */
const PRODUCTS: PlanProduct[] = [
  { partNumber: 'OB-BK0503', vinMinV: 9, vinNomV: 12, vinMaxV: 18, voutNomV: 5.0, ioutRatedA: 3.0 },
  { partNumber: 'OB-BK3305', vinMinV: 18, vinNomV: 24, vinMaxV: 36, voutNomV: 3.3, ioutRatedA: 5.0 },
  { partNumber: 'OB-BK1202', vinMinV: 16, vinNomV: 24, vinMaxV: 32, voutNomV: 12.0, ioutRatedA: 2.0 },
];
const GOOD_PATH = join(DEFAULT_PLANS_DIR, 'OB-BK0503.plan.yaml');
const GOOD = readFileSync(GOOD_PATH, 'utf8');

/** 1-based line of the first line containing `needle` at or after line `from`. */
function lineOf(text: string, needle: string, from = 1): number {
  const lines = text.split('\n');
  for (let i = from - 1; i < lines.length; i++) if (lines[i].includes(needle)) return i + 1;
  throw new Error(`"${needle}" not in text`);
}

/** Replaces exactly one occurrence (the n-th, 0-based) so each test changes one thing. */
function edit(text: string, from: string, to: string, nth = 0): string {
  let at = -1;
  for (let k = 0; k <= nth; k++) {
    at = text.indexOf(from, at + 1);
    if (at < 0) throw new Error(`"${from}" (#${nth}) not in text`);
  }
  return text.slice(0, at) + to + text.slice(at + from.length);
}

function issuesOf(text: string, opts = { products: PRODUCTS }): PlanIssue[] {
  const { plan, issues } = parsePlanText(text, 'test-plans/edited.plan.yaml', opts);
  expect(plan).toBeUndefined();
  return issues;
}

describe('the demo plan files', () => {
  it('all load and check against the demo products', () => {
    const plans = loadAllPlanFiles(DEFAULT_PLANS_DIR, { products: PRODUCTS });
    expect(plans.map((p) => p.header.partNumber).sort()).toEqual(['OB-BK0503', 'OB-BK1202', 'OB-BK3305']);
    for (const plan of plans) {
      expect(plan.header.maxAttempts).toBe(3);
      expect(plan.steps.map((s) => s.kind)).toEqual([
        'input_current_no_load',
        'vout_no_load',
        'vout_at_load',
        'load_regulation',
        'line_regulation',
        'efficiency',
        'ripple',
        'load_step',
        'protection',
      ]);
      expect(plan.checksum).toMatch(/^[0-9a-f]{64}$/);
      expect(plan.file).toBe(`test-plans/${plan.header.partNumber}.plan.yaml`);
    }
  });

  it('turn nominal ± tolerance into low/high and fill in names, units and rules', () => {
    const plan = loadPlanFile(GOOD_PATH, { products: PRODUCTS });
    const noLoad = plan.steps.find((s) => s.key === 'vout-no-load')!.limits[0];
    // 5.0 V ± 2.5 % → 4.875 … 5.125 V, tidied to 12 significant digits
    expect(noLoad).toEqual({ key: 'voutV', name: 'Output voltage, no load', unit: 'V', low: 4.875, high: 5.125, uncertainty: 0.01, rule: 'guarded' });
    const loaded = plan.steps.find((s) => s.key === 'vout-load')!.limits;
    expect(loaded.map((l) => [l.key, l.low, l.high, l.name])).toEqual([
      ['voutV@1.5', 4.9, 5.1, 'Output voltage at 1.5 A'],
      ['voutV@3', 4.9, 5.1, 'Output voltage at 3 A'],
    ]);
    const flags = plan.steps.find((s) => s.kind === 'protection')!.limits;
    expect(flags.every((l) => l.rule === 'simple' && l.uncertainty === 0 && l.unit === 'flag')).toBe(true);
  });

  it('give the same checksum whatever the key order or layout of the file', () => {
    const a = parsePlanText(GOOD, 'a', { products: PRODUCTS }).plan!;
    const reordered = edit(GOOD, 'params: { vinV: 12, settleMs: 50 }', 'params: { settleMs: 50, vinV: 12.0 }');
    const b = parsePlanText(reordered, 'b', { products: PRODUCTS }).plan!;
    expect(b.checksum).toBe(a.checksum);
    expect(stepsChecksum(a.steps)).toBe(a.checksum);
    const changed = parsePlanText(edit(GOOD, 'high: 15', 'high: 16'), 'c', { products: PRODUCTS }).plan!;
    expect(changed.checksum).not.toBe(a.checksum);
  });

  it('canonical JSON sorts keys at every level and drops undefined members', () => {
    expect(canonicalJson({ b: 1, a: { d: [{ z: 1, y: 2 }], c: undefined } })).toBe('{"a":{"d":[{"y":2,"z":1}]},"b":1}');
  });
});

describe('errors name the field path and the line', () => {
  it('YAML syntax', () => {
    const text = edit(GOOD, '    params: { vinV: 12, settleMs: 50 }', '    params: { vinV: 12, settleMs: 50');
    const [first] = issuesOf(text);
    expect(first.path).toBe('(syntax)');
    expect(first.message).toMatch(/^YAML syntax/);
    expect(first.line).toBeGreaterThan(0);
  });

  it('a value of the wrong type, in the format of the brief', () => {
    const text = edit(GOOD, 'high: 30', 'high: thirty');
    const issues = issuesOf(text);
    expect(issues).toHaveLength(1);
    expect(issues[0]).toMatchObject({ path: 'steps[6].limits[0].high', line: lineOf(text, 'high: thirty'), column: 15, message: 'must be a number' });
    expect(formatIssue(issues[0])).toBe(`test-plans/edited.plan.yaml line ${lineOf(text, 'high: thirty')}, column 15, steps[6].limits[0].high: must be a number`);
  });

  it('a parameter the step kind needs', () => {
    const text = edit(GOOD, 'params: { vinV: 12, loadsA: [1.5, 3.0], settleMs: 200 }', 'params: { vinV: 12, settleMs: 200 }');
    const issues = issuesOf(text);
    expect(issues).toEqual([
      expect.objectContaining({ path: 'steps[5].params.loadsA', line: lineOf(text, 'params: { vinV: 12, settleMs: 200 }'), message: 'is required for a step of kind efficiency' }),
    ]);
  });

  it('a misspelt field, pointing at the name', () => {
    const text = edit(GOOD, '        high: 30', '        hihg: 30');
    const issues = issuesOf(text);
    expect(issues).toContainEqual(
      expect.objectContaining({ path: 'steps[6].limits[0].hihg', line: lineOf(text, 'hihg'), column: 9, message: expect.stringMatching(/not a known field/) }),
    );
  });

  it('a duplicate step key', () => {
    const text = edit(GOOD, 'key: line-regulation', 'key: load-regulation');
    expect(issuesOf(text)).toEqual([
      expect.objectContaining({ path: 'steps[4].key', line: lineOf(text, 'key: load-regulation', lineOf(text, 'kind: load_regulation') + 1), message: 'duplicate step key "load-regulation" (already used by steps[3])' }),
    ]);
  });

  it('low not below high', () => {
    const text = edit(GOOD, 'low: -0.5\n        high: 1.5', 'low: 1.5\n        high: 1.5');
    expect(issuesOf(text)).toEqual([
      expect.objectContaining({ path: 'steps[3].limits[0].high', line: lineOf(text, 'high: 1.5'), message: 'must be above low (1.5); got high 1.5' }),
    ]);
  });

  it('a guard band that leaves no acceptance zone', () => {
    // ±2 % of 5 V is ±0.1 V; U = 0.1 V closes it (ILAC-G8 w = U)
    const text = edit(GOOD, 'uncertainty: 0.01', 'uncertainty: 0.1', 1);
    const issues = issuesOf(text);
    expect(issues).toHaveLength(1);
    expect(issues[0]).toMatchObject({ path: 'steps[2].limits[0].uncertainty', line: lineOf(text, 'uncertainty: 0.1') });
    expect(issues[0].message).toMatch(/closes the acceptance zone/);
  });

  it('the guarded rule without an uncertainty', () => {
    const text = edit(GOOD, '        uncertainty: 0.01\n', '', 0);
    expect(issuesOf(text)[0]).toMatchObject({ path: 'steps[1].limits[0].uncertainty', message: expect.stringMatching(/guarded rule needs/) });
  });

  it('a parameter the kind does not read', () => {
    const text = edit(GOOD, 'params: { loadA: 3.0, regulationDefinition', 'params: { loadA: 3.0, loadsA: [3.0], regulationDefinition');
    expect(issuesOf(text)).toEqual([
      expect.objectContaining({ path: 'steps[3].params.loadsA', message: expect.stringMatching(/not used by a step of kind load_regulation/) }),
    ]);
  });

  it('a load above the product rating and an input outside its range', () => {
    const text = edit(edit(GOOD, 'loadsA: [1.5, 3.0], settleMs: 50', 'loadsA: [1.5, 3.5], settleMs: 50'), 'vinsV: [9, 12, 18]', 'vinsV: [9, 12, 20]');
    const issues = issuesOf(text);
    expect(issues).toContainEqual(
      expect.objectContaining({ path: 'steps[2].params.loadsA[1]', message: '3.5 A is above the rated output current of OB-BK0503 (3 A)' }),
    );
    expect(issues).toContainEqual(
      expect.objectContaining({ path: 'steps[4].params.vinsV[2]', line: lineOf(text, 'vinsV: [9, 12, 20]'), message: '20 V is outside the input range of OB-BK0503 (9–18 V)' }),
    );
  });

  it('rating checks are skipped when the product is not known', () => {
    const text = edit(GOOD, 'vinsV: [9, 12, 18]', 'vinsV: [9, 12, 20]');
    expect(parsePlanText(text, 'x', {}).issues).toEqual([]);
  });

  it('an output-voltage limit copied from another product', () => {
    const text = edit(GOOD, 'nominal: 5.0', 'nominal: 3.3', 1);
    expect(issuesOf(text)).toEqual([
      expect.objectContaining({ path: 'steps[2].limits[0].nominal', message: 'limits 3.234…3.366 V do not contain the nominal output 5 V of OB-BK0503' }),
    ]);
  });

  it('a limit key the kind does not produce, and a load not in loadsA', () => {
    const text = edit(edit(GOOD, 'key: rippleMvPp', 'key: rippleMvRms'), 'key: voutV@3', 'key: voutV@2');
    const issues = issuesOf(text);
    expect(issues).toContainEqual(expect.objectContaining({ path: 'steps[6].limits[0].key', message: expect.stringMatching(/"rippleMvRms" is not a quantity of a step of kind ripple; use rippleMvPp/) }));
    expect(issues).toContainEqual(expect.objectContaining({ path: 'steps[2].limits[1].key', message: 'names 2 A, which is not in params.loadsA (1.5, 3)' }));
    // and the 3 A load is left without a limit
    expect(issues).toContainEqual(expect.objectContaining({ path: 'steps[2].params.loadsA[1]', message: 'load 3 A has no limit; add a limit with key voutV@3' }));
  });

  it('a limit with both forms, or a tolerance without nominal', () => {
    const both = edit(GOOD, 'nominal: 5.0\n        tolerancePct: 2.5', 'nominal: 5.0\n        tolerancePct: 2.5\n        low: 4.8');
    expect(issuesOf(both)[0]).toMatchObject({ path: 'steps[1].limits[0].low', message: 'write either low/high or nominal with a tolerance, not both' });
    const noNominal = edit(GOOD, 'nominal: 5.0\n        tolerancePct: 2.5', 'tolerancePct: 2.5');
    expect(issuesOf(noNominal)[0]).toMatchObject({ path: 'steps[1].limits[0].tolerancePct', message: expect.stringMatching(/needs nominal as well/) });
  });

  it('a protection flag limit that accepts both answers', () => {
    const text = edit(GOOD, 'low: 1\n        high: 1', 'low: 0\n        high: 1');
    expect(issuesOf(text)[0]).toMatchObject({ path: 'steps[8].limits[0].low', message: expect.stringMatching(/exactly one of them/) });
  });

  it('an overload that is not above the rating, a bandwidth above Nyquist, a step to the same load', () => {
    let text = edit(GOOD, 'overloadA: 6.0', 'overloadA: 3.0');
    text = edit(text, 'sampleRateHz: 100000000', 'sampleRateHz: 20000000');
    text = edit(text, 'toA: 2.25', 'toA: 0.75');
    const paths = issuesOf(text).map((i) => i.path);
    expect(paths).toEqual(['steps[6].params.bandwidthHz', 'steps[7].params.toA', 'steps[8].params.overloadA']);
  });

  it('an unknown part number', () => {
    const text = edit(GOOD, 'partNumber: OB-BK0503', 'partNumber: OB-BK9999');
    expect(issuesOf(text)).toEqual([
      expect.objectContaining({ path: 'header.partNumber', line: lineOf(text, 'partNumber'), message: 'unknown part number "OB-BK9999" (known: OB-BK0503, OB-BK3305, OB-BK1202)' }),
    ]);
  });

  it('a missing header field and a bad maxAttempts, all at once', () => {
    const text = edit(edit(GOOD, '  author: Test engineering, Plant 2\n', ''), 'maxAttempts: 3', 'maxAttempts: 0');
    const issues = issuesOf(text);
    expect(issues).toContainEqual(expect.objectContaining({ path: 'header.author', line: lineOf(text, 'planCode'), message: 'is required' }));
    expect(issues).toContainEqual(expect.objectContaining({ path: 'header.maxAttempts', line: lineOf(text, 'maxAttempts'), message: 'must be at least 1' }));
  });

  it('an acceptance zone outside the physical range, naming the field and line (issue 8, defect 8)', () => {
    // ripple ≤ 30 mV, U = 31 mV, guarded (ILAC-G8:09/2019 guard band w = U): acceptance limit −1 mV, but ripple ≥ 0
    const ripple = edit(GOOD, '        high: 30\n        uncertainty: 1\n        rule: simple', '        high: 30\n        uncertainty: 31\n        rule: guarded');
    expect(issuesOf(ripple)).toEqual([
      expect.objectContaining({ path: 'steps[6].limits[0].uncertainty', line: lineOf(ripple, 'uncertainty: 31'), message: expect.stringMatching(/no value inside the physical range 0 mV ≤ ripple/) }),
    ]);
    // efficiency ≥ 99.8 %, U = 0.5 %: acceptance from 100.3 %, beyond η < 100 % (conservation of energy)
    const eff = edit(GOOD, '        low: 93.0\n        uncertainty: 0.4\n        rule: simple', '        low: 99.8\n        uncertainty: 0.5\n        rule: guarded');
    expect(issuesOf(eff)).toEqual([
      expect.objectContaining({ path: 'steps[5].limits[0].uncertainty', line: lineOf(eff, 'uncertainty: 0.5'), message: expect.stringMatching(/0 % < η < 100 %/) }),
    ]);
  });

  it('a YAML alias bomb is refused as a plan problem, not a crash', () => {
    const bomb = ['a: &a [x, x, x, x, x, x, x, x, x, x]', ...'bcdefghij'.split('').map((k, i) => `${k}: &${k} [${Array(10).fill(`*${'abcdefghij'[i]}`).join(', ')}]`)].join('\n');
    const issues = issuesOf(bomb);
    expect(issues).toEqual([expect.objectContaining({ path: '(syntax)', message: expect.stringMatching(/YAML aliases expand too far/) })]);
  });

  it('the same limit key rule as the engine: `voutV@` refused, `efficiencyPct@1.5a` accepted', () => {
    expect(issuesOf(edit(GOOD, 'key: voutV@3', 'key: voutV@'))).toContainEqual(
      expect.objectContaining({ path: 'steps[2].limits[1].key', message: expect.stringMatching(/efficiencyPct@1.5/) }),
    );
    expect(parsePlanText(edit(GOOD, 'key: efficiencyPct@1.5', 'key: efficiencyPct@1.5a'), 'x', { products: PRODUCTS }).issues).toEqual([]);
  });

  it('an empty file', () => {
    expect(issuesOf('')[0]).toMatchObject({ path: '(file)', message: expect.stringMatching(/must be a mapping/) });
  });
});

describe('loading from disk', () => {
  const dir = mkdtempSync(join(tmpdir(), 'railwright-plans-'));
  afterAll(() => rmSync(dir, { recursive: true, force: true }));

  it('throws PlanFileError listing the problems of every file, and refuses two plans for one product', () => {
    writeFileSync(join(dir, 'a.plan.yaml'), GOOD);
    writeFileSync(join(dir, 'b.plan.yaml'), edit(GOOD, 'planCode: EOL-BK0503', 'planCode: EOL-BK0503-B'));
    writeFileSync(join(dir, 'c.plan.yaml'), edit(GOOD, 'high: 30', 'high: thirty'));
    writeFileSync(join(dir, 'notes.txt'), 'not a plan');
    let caught: unknown;
    try {
      loadAllPlanFiles(dir, { products: PRODUCTS });
    } catch (err) {
      caught = err;
    }
    expect(caught).toBeInstanceOf(PlanFileError);
    const issues = (caught as PlanFileError).issues;
    expect(issues.map((i) => [i.file?.endsWith('c.plan.yaml') || i.file?.endsWith('b.plan.yaml'), i.path])).toEqual([
      [true, 'steps[6].limits[0].high'],
      [true, 'header.partNumber'],
    ]);
    expect((caught as Error).message).toMatch(/c\.plan\.yaml line \d+, column 15, steps\[6\]\.limits\[0\]\.high: must be a number/);
  });

  it('reports a missing file as one problem', () => {
    expect(() => loadPlanFile(join(dir, 'missing.plan.yaml'))).toThrow(/cannot read the file/);
  });
});

describe('validatePlanSteps (the plans API)', () => {
  const plan = loadPlanFile(GOOD_PATH, { products: PRODUCTS });

  it('accepts the normalised steps of a good plan unchanged', () => {
    const { steps, issues } = validatePlanSteps(JSON.parse(JSON.stringify(plan.steps)), PRODUCTS[0]);
    expect(issues).toEqual([]);
    expect(stepsChecksum(steps!)).toBe(plan.checksum);
  });

  it('names the field of a bad limit', () => {
    const steps = JSON.parse(JSON.stringify(plan.steps));
    steps[2].limits[0].high = 'x';
    steps[3].limits[0].low = 2;
    expect(validatePlanSteps(steps, PRODUCTS[0]).issues).toEqual([{ path: 'steps[2].limits[0].high', message: 'must be a number' }]);
    steps[2].limits[0].high = 5.1;
    expect(validatePlanSteps(steps, PRODUCTS[0]).issues).toEqual([{ path: 'steps[3].limits[0].high', message: 'must be above low (2); got high 1.5' }]);
  });

  it('refuses something that is not a list of steps', () => {
    expect(validatePlanSteps({ a: 1 }).issues).toEqual([{ path: 'steps', message: 'must be a list' }]);
    expect(validatePlanSteps([]).issues).toEqual([{ path: 'steps', message: 'must list at least 1 item(s)' }]);
  });
});
