import { guardedLimits } from '../measure/acceptance';
import type { DecisionRule, LimitSpec, PlanProduct, PlanStep, StepKind, StepParams } from './plan-definition';
import type { RawIssue, Seg } from './plan-positions';
import { parseLimitKey, sameLoad } from './step-kinds/limit-keys';
import { PARAMS } from './step-kinds/params';
import { emptyZoneProblem } from './step-kinds/ranges';
import { kindParams, STEP_KIND_DEFS } from './step-kinds/registry';
import type { QuantityDef } from './step-kinds/types';

/*
 * The cross-field pass of the plan checks. It runs on data the schema accepted, so types can be trusted; every
 * rule about a step kind (its parameters, quantities, limit keys, physical ranges) comes from the registry.
 */

export interface RawLimit {
  key: string;
  name?: string;
  unit?: string;
  low?: number;
  high?: number;
  nominal?: number;
  tolerance?: number;
  tolerancePct?: number;
  uncertainty?: number;
  rule?: DecisionRule;
}
export interface RawStep {
  key: string;
  name: string;
  kind: StepKind;
  params: StepParams;
  limits: RawLimit[];
}

/** Limits written as nominal ± tolerance come out at 12 significant digits, so 5 × 1.02 gives 5.1, not 5.1000000000000005. */
function tidy(x: number): number {
  return Number(x.toPrecision(12));
}

/** Relative slack for comparing currents and voltages written in a plan against ratings (rounding only). */
const RATING_SLACK = 1e-9;

export function checkSteps(steps: RawStep[], product: PlanProduct | undefined, prefix: Seg[]): { issues: RawIssue[]; steps: PlanStep[] } {
  const issues: RawIssue[] = [];
  const at = (segs: Seg[], message: string, atKey = false) => issues.push({ segs: [...prefix, ...segs], message, atKey });
  const firstUse = new Map<string, number>();
  const out: PlanStep[] = [];

  steps.forEach((step, i) => {
    const s: Seg[] = [i];
    const previous = firstUse.get(step.key);
    if (previous !== undefined) at([...s, 'key'], `duplicate step key "${step.key}" (already used by steps[${previous}])`);
    else firstUse.set(step.key, i);

    const p = step.params;
    const def = STEP_KIND_DEFS[step.kind];
    const allowed = kindParams(def);
    for (const name of Object.keys(p)) {
      if (!allowed.includes(name as keyof StepParams)) {
        at([...s, 'params', name], `is not used by a step of kind ${step.kind} (it reads: ${allowed.join(', ')})`, true);
      }
    }
    checkParams(step, product, (segs, message) => at([...s, 'params', ...segs], message));

    const infos = def.quantities;
    const limits: LimitSpec[] = [];
    const limitKeys: { base: string; atA?: number; j: number }[] = [];
    step.limits.forEach((limit, j) => {
      const l: Seg[] = [...s, 'limits', j];
      const { keyOk, spec } = checkLimit(step, limit, infos, product, (segs, message) => at([...l, ...segs], message));
      if (keyOk) {
        const { base, atA } = parseLimitKey(limit.key);
        const twin = limitKeys.find((k) => k.base === base && (k.atA === undefined ? atA === undefined : atA !== undefined && sameLoad(k.atA, atA)));
        if (twin) at([...l, 'key'], `duplicate limit "${limit.key}" (already given as limits[${twin.j}])`);
        else limitKeys.push({ base, atA, j });
      }
      if (spec) limits.push(spec);
    });

    // a per-load quantity measured without a limit would be taken and thrown away: ask for the limit
    for (const info of infos.filter((q) => q.perLoad)) {
      (p.loadsA ?? []).forEach((load, k) => {
        if (!limitKeys.some((lk) => lk.base === info.base && lk.atA !== undefined && sameLoad(lk.atA, load))) {
          at([...s, 'params', 'loadsA', k], `load ${load} A has no limit; add a limit with key ${info.base}@${load}`);
        }
      });
    }

    const params: StepParams = {};
    for (const name of allowed) if (p[name] !== undefined) (params as Record<string, unknown>)[name] = p[name];
    out.push({ key: step.key, name: step.name, kind: step.kind, params, limits });
  });
  return { issues, steps: out };
}

function checkParams(step: RawStep, product: PlanProduct | undefined, at: (segs: Seg[], message: string) => void): void {
  const p = step.params;
  const rated = product?.ioutRatedA;
  const current = (segs: Seg[], a: number | undefined) => {
    if (a === undefined || rated === undefined) return;
    if (a > rated * (1 + RATING_SLACK)) at(segs, `${a} A is above the rated output current of ${product!.partNumber} (${rated} A)`);
  };
  const inputV = (segs: Seg[], v: number | undefined) => {
    if (v === undefined || !product) return;
    if (v < product.vinMinV * (1 - RATING_SLACK) || v > product.vinMaxV * (1 + RATING_SLACK)) {
      at(segs, `${v} V is outside the input range of ${product.partNumber} (${product.vinMinV}–${product.vinMaxV} V)`);
    }
  };

  for (const [name, value] of Object.entries(p) as [keyof StepParams, unknown][]) {
    const rating = PARAMS[name]?.rating;
    const values = Array.isArray(value) ? (value as number[]) : [value as number];
    values.forEach((x, k) => {
      const segs: Seg[] = Array.isArray(value) ? [name, k] : [name];
      if (rating === 'outputCurrent') current(segs, x);
      if (rating === 'inputVoltage') inputV(segs, x);
    });
  }
  STEP_KIND_DEFS[step.kind].check?.(p, product, at);
}

function checkLimit(
  step: RawStep,
  limit: RawLimit,
  infos: QuantityDef[],
  product: PlanProduct | undefined,
  at: (segs: Seg[], message: string) => void,
): { keyOk: boolean; spec?: LimitSpec } {
  const { base, atA } = parseLimitKey(limit.key);
  const info = infos.find((q) => q.base === base);
  if (!info) {
    const names = infos.map((q) => (q.perLoad ? `${q.base}@<load>` : q.base)).join(', ');
    at(['key'], `"${limit.key}" is not a quantity of a step of kind ${step.kind}; use ${names}`);
    return { keyOk: false };
  }
  if (info.perLoad) {
    if (atA === undefined || Number.isNaN(atA)) {
      at(['key'], `must name its load, e.g. ${base}@${step.params.loadsA?.[0] ?? 1.5}`);
      return { keyOk: false };
    }
    if (!(step.params.loadsA ?? []).some((a) => sameLoad(a, atA))) {
      at(['key'], `names ${atA} A, which is not in params.loadsA (${(step.params.loadsA ?? []).join(', ')})`);
      return { keyOk: false };
    }
  } else if (atA !== undefined) {
    at(['key'], `${base} is not measured per load; write it without "@"`);
    return { keyOk: false };
  }

  let ok = true;
  const fail = (segs: Seg[], message: string) => {
    ok = false;
    at(segs, message);
  };
  let unit = info.unit;
  if (limit.unit !== undefined) {
    const written = limit.unit === 'us' ? 'µs' : limit.unit;
    if (written !== info.unit) fail(['unit'], `must be "${info.unit}" for ${base} (or leave it out)`);
    unit = info.unit;
  }

  let low = limit.low;
  let high = limit.high;
  if (limit.nominal !== undefined) {
    if (low !== undefined || high !== undefined) {
      fail([low !== undefined ? 'low' : 'high'], 'write either low/high or nominal with a tolerance, not both');
    }
    if (limit.tolerance !== undefined && limit.tolerancePct !== undefined) {
      fail(['tolerancePct'], 'give tolerance (absolute) or tolerancePct (percent of nominal), not both');
    } else if (limit.tolerance === undefined && limit.tolerancePct === undefined) {
      fail(['nominal'], 'needs tolerance (absolute) or tolerancePct (percent of nominal)');
    } else {
      const tol = limit.tolerance ?? Math.abs(limit.nominal) * (limit.tolerancePct! / 100);
      low = tidy(limit.nominal - tol);
      high = tidy(limit.nominal + tol);
    }
  } else if (low === undefined && high === undefined) {
    fail(['high'], 'a limit needs low, high, or nominal with a tolerance');
  }

  if (low !== undefined && high !== undefined) {
    if (info.flag ? low > high : low >= high) {
      fail(['high'], `must be above low (${low}); got high ${high}`);
    }
  }
  if (info.flag && ok) {
    const accepts = (v: number) => (low === undefined || v >= low) && (high === undefined || v <= high);
    if (accepts(0) === accepts(1)) {
      fail(['low'], `${base} is 1 (yes) or 0 (no); its limits must accept exactly one of them, e.g. low: 1, high: 1`);
    }
  }

  const rule: DecisionRule = limit.rule ?? 'simple';
  const uncertainty = limit.uncertainty ?? 0;
  if (ok && rule === 'guarded') {
    if (uncertainty === 0) {
      fail(['uncertainty'], 'the guarded rule needs the expanded uncertainty U (k = 2) above 0; use rule: simple otherwise');
    } else {
      try {
        guardedLimits({ low, high, uncertainty, rule });
      } catch (err) {
        fail(['uncertainty'], (err as Error).message);
      }
    }
  }

  // no physically possible value inside the acceptance zone: no unit could ever pass (issue 8, defect 8)
  if (ok) {
    const empty = emptyZoneProblem(info, { low, high, uncertainty, rule }, product, step.params);
    if (empty) fail(rule === 'guarded' && uncertainty > 0 ? ['uncertainty'] : high !== undefined ? ['high'] : ['low'], empty);
  }

  // a voltage limit that excludes the product's own nominal output is almost always a copy from another product
  if (ok && product && base === 'voutV') {
    const v = product.voutNomV;
    if ((low !== undefined && v < low) || (high !== undefined && v > high)) {
      fail(limit.nominal !== undefined ? ['nominal'] : ['low'], `limits ${low ?? '−∞'}…${high ?? '+∞'} V do not contain the nominal output ${v} V of ${product.partNumber}`);
    }
  }

  if (!ok) return { keyOk: true };
  const name = limit.name ?? info.name.replace('{load}', String(atA));
  const spec: LimitSpec = { key: limit.key, name, unit, uncertainty, rule };
  if (low !== undefined) spec.low = low;
  if (high !== undefined) spec.high = high;
  return { keyOk: true, spec };
}
