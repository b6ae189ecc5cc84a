import { EntityManager } from '@mikro-orm/sqlite';
import { Injectable, NotFoundException } from '@nestjs/common';
import { valueWords, fieldWords, capitalise } from '../audit/audit-fields';
import { AuditService } from '../audit/audit.service';
import type { AuditEventDto } from '../audit/dto/audit.dto';
import type { HistoryMeasurementDto, HistoryRunDto, UnitHistoryDto } from './dto/unit-history.dto';
import { normalisedSerial } from './units.service';

/** A unit's state in the product's words, and what it means for the unit next (its disposition). */
const STATE_WORDS: Readonly<Record<string, { state: string; disposition: string }>> = {
  untested: { state: 'Untested', disposition: 'Waiting for its first test' },
  passed: { state: 'Passed', disposition: 'Passed its final test' },
  failed: { state: 'Failed', disposition: 'Failed: waiting for retest or repair' },
  in_repair: { state: 'In repair', disposition: 'In repair' },
  scrapped: { state: 'Scrapped', disposition: 'Scrapped' },
};

// keys of a repair record in an audit event's `after` (H6 writes symptom, cause and action)
const REPAIR_KEYS = ['symptom', 'cause', 'causeCode', 'causeName', 'action', 'actionTaken', 'note'];

const iso = (v: unknown): string | null => (v === null || v === undefined ? null : new Date(typeof v === 'number' ? v : Number(v) || Date.parse(String(v))).toISOString());
const num = (v: unknown): number | null => (v === null || v === undefined ? null : Number(v));
const text = (v: unknown): string | null => (v === null || v === undefined ? null : String(v));

/**
 * One unit's whole history: every run with its measurements and traceability (plan version and checksum,
 * station, fixture and its calibration, operator), and every repair step and disposition from the audit trail.
 * Plain SQL on the indexes test_runs(unit_id) and measurements(run_id): no entity is hydrated, so a unit with
 * hundreds of runs still answers in one pass, and no password hash is ever read.
 */
@Injectable()
export class UnitHistoryService {
  private calibrationColumn: Promise<boolean> | null = null;

  constructor(
    private readonly em: EntityManager,
    private readonly audit: AuditService,
  ) {}

  private sql(query: string, params: unknown[]): Promise<Record<string, unknown>[]> {
    return this.em.getConnection().execute(query, params);
  }

  /** `test_runs.calibration_id` is added by the calibration work; read it only where it exists. */
  private hasCalibrationColumn(): Promise<boolean> {
    this.calibrationColumn ??= this.sql(`select name from pragma_table_info('test_runs') where name = 'calibration_id'`, []).then((r) => r.length > 0);
    return this.calibrationColumn;
  }

  async history(raw: string): Promise<UnitHistoryDto> {
    const serial = normalisedSerial(raw);
    const [u] = await this.sql(
      'select un.id, un.serial, un.state, un.test_count, un.sent_to_repair_at, l.id as lot_id, l.code as lot_code, l.state as lot_state, ' +
        'p.id as product_id, p.part_number, p.name as product_name from units un join lots l on l.id = un.lot_id join products p on p.id = un.product_id where un.serial = ?',
      [serial],
    );
    if (!u) {
      throw new NotFoundException({ message: `No unit with serial "${serial}" is registered. Check the label and try again.`, details: { code: 'unknown_serial' } });
    }
    const unitId = Number(u.id);
    const runs = await this.runs(unitId);
    const events = await this.audit.eventsFor([
      { entityType: 'unit', ids: [String(unitId)] },
      { entityType: 'test_run', ids: runs.map((r) => String(r.id)) },
    ]);
    const words = STATE_WORDS[String(u.state)] ?? { state: String(u.state), disposition: String(u.state) };
    return {
      unit: {
        id: unitId,
        serial: String(u.serial),
        state: String(u.state),
        stateWords: words.state,
        disposition: dispositionOf(String(u.state), !!u.sent_to_repair_at, Number(u.test_count), words.disposition),
        testCount: Number(u.test_count),
        sentToRepairAt: iso(u.sent_to_repair_at),
        product: { id: Number(u.product_id), partNumber: String(u.part_number), name: String(u.product_name) },
        lot: { id: Number(u.lot_id), code: String(u.lot_code), state: String(u.lot_state) },
      },
      runs,
      events,
      repairRecords: Object.fromEntries(events.map((e) => [String(e.id), repairRecord(e)]).filter(([, r]) => (r as unknown[]).length > 0)),
    };
  }

  private async runs(unitId: number): Promise<HistoryRunDto[]> {
    const calibration = (await this.hasCalibrationColumn()) ? 'r.calibration_id' : 'null';
    const rows = await this.sql(
      `select r.id, r.attempt, r.verdict, r.end_reason, r.error_message, r.failed_step_key, r.started_at, r.finished_at, r.override_reason, ` +
        `r.fixture_identity, r.fixture_calibration_due_at, ${calibration} as calibration_id, r.operator_name, ` +
        `v.id as version_id, v.plan_id, v.version, v.checksum, tp.code as plan_code, s.id as station_id, s.code as station_code, s.name as station_name, ` +
        `f.id as fixture_id, f.code as fixture_code, f.calibrated_at, f.calibration_due_at, f.calibration_certificate, o.username, o.display_name ` +
        `from test_runs r join plan_versions v on v.id = r.plan_version_id join test_plans tp on tp.id = v.plan_id ` +
        `join stations s on s.id = r.station_id join fixtures f on f.id = r.fixture_id left join users o on o.id = r.operator_id ` +
        `where r.unit_id = ? order by r.started_at desc, r.id desc`,
      [unitId],
    );
    const measurements = await this.sql(
      'select m.id, m.run_id, m.step_index, m.step_key, m.step_name, m.quantity, m.name, m.value, m.unit, m.low_limit, m.high_limit, ' +
        'm.guarded_low, m.guarded_high, m.uncertainty, m.rule, m.verdict, m.decision, m.measured_at ' +
        'from measurements m where m.run_id in (select id from test_runs where unit_id = ?) order by m.run_id, m.step_index, m.id',
      [unitId],
    );
    const byRun = new Map<number, HistoryMeasurementDto[]>();
    for (const m of measurements) {
      const list = byRun.get(Number(m.run_id)) ?? [];
      list.push({
        id: Number(m.id),
        stepIndex: Number(m.step_index),
        stepKey: String(m.step_key),
        stepName: String(m.step_name),
        quantity: String(m.quantity),
        name: String(m.name),
        value: num(m.value),
        unit: String(m.unit),
        lowLimit: num(m.low_limit),
        highLimit: num(m.high_limit),
        guardedLow: num(m.guarded_low),
        guardedHigh: num(m.guarded_high),
        uncertainty: Number(m.uncertainty ?? 0),
        rule: String(m.rule),
        verdict: String(m.verdict),
        decision: text(m.decision),
        measuredAt: iso(m.measured_at)!,
      });
      byRun.set(Number(m.run_id), list);
    }
    return rows.map((r) => ({
      id: Number(r.id),
      attempt: Number(r.attempt),
      verdict: String(r.verdict),
      endReason: text(r.end_reason),
      errorMessage: text(r.error_message),
      failedStepKey: text(r.failed_step_key),
      startedAt: iso(r.started_at)!,
      finishedAt: iso(r.finished_at),
      plan: { versionId: Number(r.version_id), planId: Number(r.plan_id), code: String(r.plan_code), version: Number(r.version), checksum: String(r.checksum) },
      station: { id: Number(r.station_id), code: String(r.station_code), name: String(r.station_name) },
      fixture: {
        id: Number(r.fixture_id),
        code: String(r.fixture_code),
        identity: text(r.fixture_identity),
        calibrationDueAtRun: iso(r.fixture_calibration_due_at),
        calibrationId: num(r.calibration_id),
        calibratedAt: iso(r.calibrated_at),
        calibrationDueAt: iso(r.calibration_due_at),
        certificate: text(r.calibration_certificate),
      },
      // the name the run recorded wins: the user may have been renamed since
      operator: { username: text(r.username), displayName: text(r.operator_name) ?? text(r.display_name) ?? text(r.username) ?? 'unknown' },
      overrideReason: text(r.override_reason),
      measurements: byRun.get(Number(r.id)) ?? [],
    }));
  }
}

function dispositionOf(state: string, sentToRepair: boolean, testCount: number, plain: string): string {
  if (state === 'failed' && sentToRepair) return 'Failed: sent to repair';
  // back from repair: untested again, but not new
  if (state === 'untested' && testCount > 0) return 'Returned from repair: waiting for retest';
  return plain;
}

/** The repair record an event carries (flat keys, or nested under `repair`), each field in words. */
export function repairRecord(e: Pick<AuditEventDto, 'after'>): { field: string; value: string }[] {
  const after = e.after ?? {};
  // the repair loop writes the record under `repairRecord` (symptom, cause, action, disposition)
  const held = after.repairRecord ?? after.repair;
  const nested = held && typeof held === 'object' ? (held as Record<string, unknown>) : null;
  const source = nested
    ? Object.fromEntries(Object.entries(nested).filter(([k]) => !['id', 'causeId', 'correctsId'].includes(k)))
    : Object.fromEntries(REPAIR_KEYS.filter((k) => k in after).map((k) => [k, after[k]]));
  return Object.entries(source)
    .map(([k, v]) => {
      const f = fieldWords(k);
      return { field: capitalise(f.words), value: valueWords(v, f.unit) };
    })
    .filter((x): x is { field: string; value: string } => x.value !== null && x.value !== '');
}
