import { EntityManager } from '@mikro-orm/sqlite';
import { BadRequestException, Injectable } from '@nestjs/common';
import { andersonDarling, capability, histogram, individualsChart, MIN_AD_SAMPLE, sortedSample, xbarRChart, type SpecLimits } from '../stats';
import type { ControlChartQueryDto, QuantityQueryDto, YieldFilterDto } from './dto/yield-query.dto';
import { ALL_RUN_FILTERS, resolveFilter, runConditions, type RunFilter, type SqlPart } from './yield-filter';
import type { CapabilityView, ChartPanel, ControlChartView, QuantityChoice, QuantityLimits } from '../contract/yield-views';

/** Quantities offered for capability are read from this many recent runs of the product (plans change rarely). */
const RECENT_RUNS_FOR_CHOICES = 200;

/**
 * Capability and control charts of one measured quantity. Values come from judged runs (PASS or FAIL) only: a
 * run that ended in an error or was stopped did not judge the unit, and its readings may be from a faulty set-up.
 * Values are in production order (run start time). All arithmetic is in ../stats.
 */
@Injectable()
export class QuantityStatsService {
  constructor(private readonly em: EntityManager) {}

  /** The quantities a product's recent runs measured, in plan order. */
  async quantities(q: YieldFilterDto): Promise<QuantityChoice[]> {
    const f = resolveFilter(q);
    requireProductOrLot(f);
    const where = runConditions(f, 'r', ['lotId', 'productId']);
    const rows = (await this.em.getConnection().execute(
      `select m.step_key, m.quantity, max(m.step_name) as step_name, max(m.name) as name, max(m.unit) as unit, min(m.step_index) as idx
       from measurements m
       where m.run_id in (select r.id from test_runs r where r.verdict in ('pass', 'fail')${where.sql} order by r.id desc limit ${RECENT_RUNS_FOR_CHOICES})
         and m.value is not null
       group by m.step_key, m.quantity order by idx, m.step_key, m.quantity`,
      where.params,
    )) as { step_key: string; quantity: string; step_name: string; name: string; unit: string }[];
    return rows.map((r) => ({ step: r.step_key, stepName: r.step_name, quantity: r.quantity, name: r.name, unit: r.unit }));
  }

  async capability(q: QuantityQueryDto): Promise<CapabilityView> {
    const f = resolveFilter(q);
    requireProductOrLot(f);
    const sel = selection(f, q);
    // One pass over the quantity's rows for the values and their limit sets: the limits are not in the covering
    // index, so a second statement grouping the limits read every row again (bench:yield, issue 12).
    const rows = (await this.em.getConnection().execute(
      `select m.value, m.low_limit, m.high_limit, m.guarded_low, m.guarded_high, m.unit, m.name, m.step_name, r.started_at
       ${sel.sql} order by r.started_at, r.id, m.id`,
      sel.params,
    )) as Record<string, unknown>[];
    const values = rows.map((r) => r.value as number);
    const sets = limitSets(rows);
    const latest = sets[0];
    const limits: QuantityLimits = {
      lowLimit: num(latest?.low_limit),
      highLimit: num(latest?.high_limit),
      guardedLow: num(latest?.guarded_low),
      guardedHigh: num(latest?.guarded_high),
    };
    const base = {
      step: q.step,
      quantity: q.quantity,
      name: latest ? String(latest.name) : q.quantity,
      stepName: latest ? String(latest.step_name) : q.step,
      unit: latest ? String(latest.unit) : '',
      n: values.length,
      limits,
      limitSets: sets.length,
    };
    if (values.length === 0) {
      return { ...base, histogram: null, capability: null, normalityPValue: null, problem: 'No values of this quantity in the selection.' };
    }
    const include = [limits.lowLimit, limits.highLimit, limits.guardedLow, limits.guardedHigh].filter((v): v is number => v !== null);
    // one sort shared by the histogram's quartiles and range and the normality test
    const sorted = sortedSample(values);
    const hist = histogram(values, { include, sorted });
    const spec: SpecLimits = {
      ...(limits.lowLimit !== null ? { lsl: limits.lowLimit } : {}),
      ...(limits.highLimit !== null ? { usl: limits.highLimit } : {}),
    };
    let report: CapabilityView['capability'] = null;
    let problem: string | null = null;
    if (spec.lsl === undefined && spec.usl === undefined) problem = 'This quantity has no specification limit, so there is no capability to compute.';
    else {
      try {
        report = capability(values, spec, { subgroupSize: q.subgroupSize ?? 1 });
      } catch (e) {
        // the statistics refuse with a message a person can read (too few values, no spread ...)
        if (!(e instanceof RangeError)) throw e;
        problem = e.message;
      }
    }
    let normalityPValue: number | null = null;
    if (values.length >= MIN_AD_SAMPLE) {
      try {
        normalityPValue = andersonDarling(values, sorted).pValue;
      } catch (e) {
        if (!(e instanceof RangeError)) throw e;
      }
    }
    return { ...base, histogram: hist, capability: report, normalityPValue, problem };
  }

  async controlChart(q: ControlChartQueryDto): Promise<ControlChartView> {
    const f = resolveFilter(q);
    requireProductOrLot(f);
    const sel = selection(f, q, 'join units u on u.id = r.unit_id');
    const limit = q.points ?? 200;
    const size = q.subgroupSize ?? 1;
    const rules = q.rules ?? 'western-electric';
    const rows = (
      (await this.em.getConnection().execute(
        `select m.value, u.serial, r.id as run_id, m.name, m.unit ${sel.sql}
         order by r.started_at desc, r.id desc, m.id desc limit ?`,
        [...sel.params, limit],
      )) as { value: number; serial: string; run_id: number; name: string; unit: string }[]
    ).reverse();
    const base = { step: q.step, quantity: q.quantity, name: rows[0]?.name ?? q.quantity, unit: rows[0]?.unit ?? '', subgroupSize: size, rules };
    const empty = (problem: string): ControlChartView => ({ ...base, kind: null, n: 0, location: null, spread: null, violations: [], problem });
    if (size === 1) {
      if (rows.length < 2) return empty('An individuals chart needs at least 2 values; the selection has ' + rows.length + '.');
      const chart = individualsChart(rows.map((r) => r.value), rules);
      const points = rows.map((r, i) => ({ index: i, value: r.value, label: r.serial, runIds: [r.run_id] }));
      return {
        ...base,
        kind: chart.kind,
        n: rows.length,
        location: panel(chart.individuals, points),
        spread: {
          ...panel(chart.movingRange, chart.movingRange.points.map((v, i) => ({ index: i + 1, value: v, label: `${rows[i].serial} → ${rows[i + 1].serial}`, runIds: [rows[i].run_id, rows[i + 1].run_id] }))),
          signals: chart.movingRange.signals,
        },
        violations: chart.individuals.violations,
        problem: null,
      };
    }
    const groups: (typeof rows)[] = [];
    for (let i = 0; i + size <= rows.length; i += size) groups.push(rows.slice(i, i + size));
    if (groups.length < 2) return empty(`An X̄–R chart with subgroups of ${size} needs at least ${2 * size} values; the selection has ${rows.length}.`);
    const chart = xbarRChart(groups.map((g) => g.map((r) => r.value)), rules);
    const who = (g: typeof rows) => `${g[0].serial} … ${g[g.length - 1].serial}`;
    return {
      ...base,
      kind: chart.kind,
      n: groups.length * size,
      location: panel(chart.xbar, chart.xbar.points.map((v, i) => ({ index: i, value: v, label: who(groups[i]), runIds: groups[i].map((r) => r.run_id) }))),
      spread: {
        ...panel(chart.range, chart.range.points.map((v, i) => ({ index: i, value: v, label: who(groups[i]), runIds: groups[i].map((r) => r.run_id) }))),
        signals: chart.range.signals,
      },
      violations: chart.xbar.violations,
      problem: null,
    };
  }
}

/** `from … where …` selecting one quantity's values from judged runs in the filter. */
function selection(f: RunFilter, q: QuantityQueryDto, join = ''): SqlPart {
  const where = runConditions(f, 'r', ALL_RUN_FILTERS);
  // Speed only (issue 12, bench:yield): CROSS JOIN makes SQLite read the filtered runs first (a lot, a product
  // and its date range: an index in start order) and probe each run's measurements, instead of every stored
  // value of the quantity over the whole history; a control chart then stops after its last N runs.
  return {
    sql: `from test_runs r cross join measurements m on m.run_id = r.id ${join}
      where r.verdict in ('pass', 'fail') and m.step_key = ? and m.quantity = ? and m.value is not null${where.sql}`,
    params: [q.step, q.quantity, ...where.params],
  };
}

/**
 * The distinct limit sets (low, high, guarded low, guarded high) among the rows, the most recently used first,
 * each with the unit and names of its latest row. Rows come in production order, so the last row of a set is its
 * latest; SQL NULL and a number never match (as SQL's GROUP BY keeps NULL apart).
 */
function limitSets(rows: readonly Record<string, unknown>[]): Record<string, unknown>[] {
  const latest = new Map<string, { row: Record<string, unknown>; at: number; order: number }>();
  rows.forEach((r, order) => {
    const key = `${String(r.low_limit)}|${String(r.high_limit)}|${String(r.guarded_low)}|${String(r.guarded_high)}`;
    latest.set(key, { row: r, at: Number(r.started_at), order });
  });
  return [...latest.values()].sort((a, b) => b.at - a.at || b.order - a.order).map((x) => x.row);
}

/** A quantity's limits and meaning belong to a product's plan: mixing products would mix specifications. */
function requireProductOrLot(f: RunFilter): void {
  if (f.productId === undefined && f.lotId === undefined) {
    throw new BadRequestException({
      message: 'productId: choose a product (or a lot) first; a quantity’s limits belong to one product’s plan',
      details: [{ field: 'productId', problems: ['needed (or lotId) for a quantity view'] }],
    });
  }
}

function panel(limits: { centre: number; upper: number; lower: number }, points: ChartPanel['points']): ChartPanel {
  return { centre: limits.centre, upper: limits.upper, lower: limits.lower, points };
}

function num(v: unknown): number | null {
  return v === null || v === undefined ? null : Number(v);
}
