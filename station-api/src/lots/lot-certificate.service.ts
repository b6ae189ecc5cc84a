import { EntityManager } from '@mikro-orm/sqlite';
import { Injectable } from '@nestjs/common';
import { YieldFiguresService } from '../yield/yield-figures.service';
import { summarizeQuantities, type CertificateContent, type QuantityValue } from './certificate-content';
import type { Lot } from './lot.entity';

const STATISTICS_BASIS =
  'Values of the conforming units from the run that passed each of them (its last judged run), in production order. ' +
  'Std dev: sample standard deviation (n - 1). Cpk: min(USL - mean, mean - LSL) / 3 sigma, sigma from the moving range of consecutive units (MR-bar / d2), one-sided where only one limit exists.';

const num = (v: unknown): number | null => (v === null || v === undefined ? null : Number(v));
const date = (v: unknown): Date | null => (v === null || v === undefined ? null : new Date(Number(v)));

/** Gathers what a lot's certificate of conformance states (read-only; the yield figures from the yield module). */
@Injectable()
export class LotCertificateService {
  constructor(
    private readonly em: EntityManager,
    private readonly yieldFigures: YieldFiguresService,
  ) {}

  async content(lot: Lot, release: { by: string; at: Date; comment: string | null }): Promise<CertificateContent> {
    const conn = this.em.getConnection();
    const counts = (await conn.execute(
      `select count(*) as registered, sum(case when state = 'passed' then 1 else 0 end) as passed, sum(case when state = 'scrapped' then 1 else 0 end) as scrapped
       from units where lot_id = ?`,
      [lot.id],
    )) as { registered: number; passed: number | null; scrapped: number | null }[];
    const plans = (await conn.execute(
      `select tp.code as plan_code, tp.name as plan_name, pv.version, pv.checksum, count(*) as runs
       from test_runs r join plan_versions pv on pv.id = r.plan_version_id join test_plans tp on tp.id = pv.plan_id
       where r.lot_id = ? group by pv.id order by tp.code, pv.version`,
      [lot.id],
    )) as { plan_code: string; plan_name: string; version: number; checksum: string; runs: number }[];
    // the calibration due date each run recorded at its start; the earliest one is what the lot was tested under
    const fixtures = (await conn.execute(
      `select f.code, f.name, count(*) as runs, min(r.fixture_calibration_due_at) as due_at_test, f.calibration_due_at as due_now
       from test_runs r join fixtures f on f.id = r.fixture_id
       where r.lot_id = ? group by f.id order by f.code`,
      [lot.id],
    )) as { code: string; name: string; runs: number; due_at_test: number | null; due_now: number | null }[];
    const figures = await this.yieldFigures.figures({ lotId: lot.id, by: 'lot' });
    const values = (await conn.execute(
      `with last_judged as (
         select r.id, r.started_at, row_number() over (partition by r.unit_id order by r.attempt desc, r.id desc) as rk
         from test_runs r join units u on u.id = r.unit_id
         where r.lot_id = ? and u.state = 'passed' and r.verdict in ('pass', 'fail')
       )
       select m.step_key, m.step_name, m.quantity, m.name, m.unit, m.value, m.low_limit, m.high_limit
       from last_judged j join measurements m on m.run_id = j.id
       where j.rk = 1 and m.value is not null
       order by m.step_index, m.step_key, m.quantity, j.started_at, j.id`,
      [lot.id],
    )) as Record<string, unknown>[];
    const quantityValues: QuantityValue[] = values.map((v) => ({
      stepKey: String(v.step_key),
      stepName: String(v.step_name),
      quantity: String(v.quantity),
      name: String(v.name),
      unit: String(v.unit ?? ''),
      value: Number(v.value),
      lowLimit: num(v.low_limit),
      highLimit: num(v.high_limit),
    }));
    const c = counts[0];
    return {
      certificateNo: `COC-${lot.code}`,
      lot: { code: lot.code, createdAt: lot.createdAt, plannedQuantity: lot.plannedQuantity },
      product: { partNumber: lot.product.partNumber, name: lot.product.name },
      quantities: { registered: Number(c?.registered ?? 0), passed: Number(c?.passed ?? 0), scrapped: Number(c?.scrapped ?? 0) },
      planVersions: plans.map((p) => ({ planCode: p.plan_code, planName: p.plan_name, version: Number(p.version), checksum: p.checksum, runs: Number(p.runs) })),
      fixtures: fixtures.map((f) => ({ code: f.code, name: f.name, runs: Number(f.runs), calibrationDueAtTest: date(f.due_at_test), calibrationDueNow: date(f.due_now) })),
      yield: {
        unitsTested: figures.overall.unitsTested,
        firstPass: figures.overall.firstPass,
        final: figures.overall.final,
        definitions: { firstPass: figures.definitions.firstPass, final: figures.definitions.final, interval: figures.definitions.interval },
      },
      statistics: summarizeQuantities(quantityValues),
      statisticsBasis: STATISTICS_BASIS,
      release,
    };
  }
}
