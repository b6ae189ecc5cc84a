import { EntityManager } from '@mikro-orm/sqlite';
import { Injectable } from '@nestjs/common';
import { ConfigService } from '@nestjs/config';
import type { EnvironmentVariables } from '../config/env.validation';
import { parseShiftStarts, shiftAt, type ShiftStart } from '../shift/shift';
import { rolledThroughputYield, wilsonInterval } from '../stats';
import type { BreakdownDimension } from '../contract/yield-views';
import type { YieldFiguresQueryDto } from './dto/yield-query.dto';
import { perUnitCte, resolveFilter, type RunFilter } from './yield-filter';
import type { RtyStep, YieldFiguresView, YieldGroup } from '../contract/yield-views';

interface GroupRow {
  grp: string | number;
  label: string | null;
  tested: number;
  first_passed: number;
  final_passed: number;
}

/** Local calendar day of an epoch-ms column, in the server's time zone like the shift module. */
const LOCAL_DAY = `date(p.started_at / 1000, 'unixepoch', 'localtime')`;
const LOCAL_MINUTE = `(cast(strftime('%H', p.started_at / 1000, 'unixepoch', 'localtime') as integer) * 60 + cast(strftime('%M', p.started_at / 1000, 'unixepoch', 'localtime') as integer))`;

/** How each breakdown dimension groups the per-unit rows: group key, label and the join that names it. */
const DIMENSIONS: Record<BreakdownDimension, { key: string; label: string; join: string }> = {
  lot: { key: 'p.lot_id', label: 'max(d.code)', join: 'join lots d on d.id = p.lot_id' },
  product: { key: 'p.product_id', label: 'max(d.part_number)', join: 'join products d on d.id = p.product_id' },
  station: { key: 'p.station_id', label: 'max(d.code)', join: 'join stations d on d.id = p.station_id' },
  fixture: { key: 'p.fixture_id', label: 'max(d.code)', join: 'join fixtures d on d.id = p.fixture_id' },
  operator: { key: 'p.operator_id', label: 'max(d.display_name)', join: 'join users d on d.id = p.operator_id' },
  day: { key: LOCAL_DAY, label: LOCAL_DAY, join: '' },
  // grouped by minute of the day here, then folded into shifts with the shift module
  shift: { key: LOCAL_MINUTE, label: 'null', join: '' },
};

export const YIELD_DEFINITIONS = {
  firstPass: 'units whose first judged run (lowest attempt with a PASS or FAIL verdict) passed ÷ units with a judged first run',
  final: 'units whose latest judged run passed and that are not scrapped ÷ the same units',
  rty: 'product of the first-pass yields of the plan steps, over the units’ first judged runs',
  interval: '95 % Wilson score interval',
};

const RTY_NOTE =
  'No interval for RTY itself: the steps see dependent sets of units, so each step carries its own 95 % Wilson score interval.';

/** First-pass, final and rolled throughput yield with their breakdown and daily trend (SQL aggregates only). */
@Injectable()
export class YieldFiguresService {
  private readonly shiftStarts: ShiftStart[];

  constructor(
    private readonly em: EntityManager,
    config: ConfigService<EnvironmentVariables, true>,
  ) {
    // validated at start-up (env.validation.ts); the same parser the shift counters use
    this.shiftStarts = parseShiftStarts(config.get('SHIFT_STARTS', { infer: true }));
  }

  async figures(q: YieldFiguresQueryDto): Promise<YieldFiguresView> {
    const filter = resolveFilter(q);
    const by = q.by ?? 'lot';
    const { groups, days, steps } = await this.read(filter, by);
    const breakdown = this.toGroups(groups, by);
    const trend = by === 'day' ? breakdown : this.toGroups(days, 'day');
    const total = breakdown.reduce(
      (acc, g) => ({ tested: acc.tested + g.unitsTested, first: acc.first + g.firstPass.x, final: acc.final + g.final.x }),
      { tested: 0, first: 0, final: 0 },
    );
    return {
      by,
      overall: group('all', 'All units in the selection', total.tested, total.first, total.final),
      rty: rtyOf(steps),
      breakdown,
      trend,
      definitions: YIELD_DEFINITIONS,
    };
  }

  /**
   * One statement for the whole view: the per-unit rows are ranked once (a materialized CTE) and read three
   * times, for the breakdown, the daily trend and RTY. RTY reads the per-step outcome of each first judged run
   * from `run_steps` (kept by a trigger with the measurements, Migration20261203020000) instead of the
   * measurements themselves: same counts, a tenth of the rows, none of them wide.
   */
  private async read(filter: RunFilter, by: BreakdownDimension): Promise<{ groups: GroupRow[]; days: GroupRow[]; steps: StepRow[] }> {
    const cte = perUnitCte(filter);
    const d = DIMENSIONS[by];
    // the first branch names the columns of the whole UNION ALL
    const counts = `count(*) as tested, sum(case when p.first_verdict = 'pass' then 1 else 0 end) as first_passed,
  sum(case when p.last_verdict = 'pass' and u.state <> 'scrapped' then 1 else 0 end) as final_passed, null as step_index`;
    const trend =
      by === 'day'
        ? ''
        : `union all
select 't', ${DIMENSIONS.day.key}, ${DIMENSIONS.day.label}, ${counts} from per_unit p join units u on u.id = p.unit_id group by ${DIMENSIONS.day.key}
`;
    const rows = (await this.em.getConnection().execute(
      `${cte.sql}
select 'g' as part, ${d.key} as grp, ${d.label} as label, ${counts}
from per_unit p join units u on u.id = p.unit_id ${d.join}
group by grp
${trend}union all
select 'r', l.step_key, max(l.step_name), sum(x.entered), sum(x.passed), null, min(x.step_index)
from (
  select s.step_label_id, min(s.step_index) as step_index, count(*) as entered, sum(case when s.failed = 0 then 1 else 0 end) as passed
  from per_unit p join run_steps s on s.run_id = p.run_id group by s.step_label_id
) x join step_labels l on l.id = x.step_label_id
group by l.step_key`,
      cte.params,
    )) as (GroupRow & { part: 'g' | 't' | 'r'; step_index: number | null })[];
    const out = { groups: [] as GroupRow[], days: [] as GroupRow[], steps: [] as StepRow[] };
    for (const r of rows) {
      if (r.part === 'g') out.groups.push(r);
      else if (r.part === 't') out.days.push(r);
      else out.steps.push({ step_key: String(r.grp), step_name: String(r.label), step_index: Number(r.step_index), entered: r.tested, passed: r.first_passed });
    }
    return out;
  }

  private toGroups(rows: GroupRow[], by: BreakdownDimension): YieldGroup[] {
    if (by === 'shift') return this.foldShifts(rows);
    const out = rows.map((r) => group(String(r.grp), String(r.label ?? r.grp), r.tested, r.first_passed, r.final_passed));
    return out.sort((a, b) => (by === 'day' ? a.key.localeCompare(b.key) : a.label.localeCompare(b.label, undefined, { numeric: true })));
  }

  /** Minute-of-day groups → shifts, placed by the shift module (a shift that runs past midnight stays one shift). */
  private foldShifts(rows: GroupRow[]): YieldGroup[] {
    const acc = new Map<number, { name: string; tested: number; first: number; final: number }>();
    for (const r of rows) {
      const minute = Number(r.grp);
      // any ordinary day will do: only the time of day decides the shift
      const w = shiftAt(new Date(2001, 0, 15, Math.floor(minute / 60), minute % 60), this.shiftStarts);
      const a = acc.get(w.number) ?? { name: w.name, tested: 0, first: 0, final: 0 };
      a.tested += r.tested;
      a.first += r.first_passed;
      a.final += r.final_passed;
      acc.set(w.number, a);
    }
    return [...acc.entries()].sort((a, b) => a[0] - b[0]).map(([n, a]) => group(String(n), a.name, a.tested, a.first, a.final));
  }
}

interface StepRow {
  step_key: string;
  step_name: string;
  step_index: number;
  entered: number;
  passed: number;
}

/** RTY over the steps of the first judged runs, in plan order (lowest step index, then key). */
function rtyOf(unordered: StepRow[]): YieldFiguresView['rty'] {
  if (unordered.length === 0) return { value: null, normalizedYield: null, steps: [], note: RTY_NOTE };
  // the order SQL's "order by min(step_index), step_key" gave (binary comparison of the keys)
  const rows = [...unordered].sort((a, b) => a.step_index - b.step_index || (a.step_key < b.step_key ? -1 : a.step_key > b.step_key ? 1 : 0));
  const r = rolledThroughputYield(rows.map((s) => ({ step: s.step_key, entered: s.entered, passedFirstTime: s.passed })));
  const steps: RtyStep[] = rows.map((s, i) => {
    const { x, n, estimate, lower, upper, confidence, method } = r.steps[i];
    return { stepKey: s.step_key, stepName: s.step_name, entered: s.entered, passedFirstTime: s.passed, firstPass: { x, n, estimate, lower, upper, confidence, method } };
  });
  return { value: r.rty, normalizedYield: r.normalizedYield, steps, note: RTY_NOTE };
}

function group(key: string, label: string, tested: number, firstPassed: number, finalPassed: number): YieldGroup {
  return {
    key,
    label,
    unitsTested: tested,
    // each figure on its own: a unit that passed first and was scrapped later yields first-pass but not final
    firstPass: wilsonInterval(firstPassed, tested),
    final: wilsonInterval(finalPassed, tested),
  };
}
