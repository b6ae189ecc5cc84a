import { EntityManager } from '@mikro-orm/sqlite';
import { BadRequestException, ConflictException, Injectable, NotFoundException } from '@nestjs/common';
import { AuditService } from '../audit/audit.service';
import { RunEngineService } from '../runs/run-engine.service';
import { RunVerdict, TestRun } from '../runs/test-run.entity';
import { Unit, UnitState } from '../units/unit.entity';
import { User } from '../users/user.entity';
import { toUnitDto } from '../units/units.service';
import type { UnitDto } from '../units/dto/unit.dto';
import { ACTIONS_WITH_RECORD, type RepairActionDto, type RepairResultDto, type SendToRepairDto } from './dto/repair.dto';
import { RepairDisposition, RepairRecord } from './repair-record.entity';
import { recordForAudit } from './repair-record-views';
import { activeCause, RepairRecordsService } from './repair-records.service';
import { REPAIR_AUDIT_ACTIONS, repairTransition, type UnitStateName } from './repair-transitions';

// same bound as the units route: longer input is a scan error
const MAX_SERIAL_LENGTH = 64;

/**
 * Moves a unit through the repair loop (receive, return for retest, scrap). Changes only the unit's state
 * (and, on return, the point its retest attempts count from); runs and measurements are never touched.
 * Each step is written to the audit trail; return for retest and scrap also write a repair record (symptom,
 * cause, action taken, disposition), whose content the audit event carries in `after.repairRecord`.
 */
@Injectable()
export class RepairService {
  constructor(
    private readonly em: EntityManager,
    private readonly audit: AuditService,
    private readonly engine: RunEngineService,
    private readonly records: RepairRecordsService,
  ) {}

  async act(rawSerial: string, dto: RepairActionDto, actorId: number): Promise<RepairResultDto> {
    const serial = checkedSerial(rawSerial);
    const withRecord = ACTIONS_WITH_RECORD.includes(dto.action);
    if (!withRecord) refuseRecordFields(dto);
    // one transaction: read, check and write the state with its audit event, so two technicians acting at
    // once cannot both move the unit from the same state (SQLite serialises the transactions)
    return this.em.fork().transactional(async (em) => {
      const unit = await em.findOne(Unit, { serial }, { populate: ['lot', 'product'] });
      if (!unit) {
        throw new NotFoundException({ message: `No unit with serial "${serial}" is registered. Check the label.`, details: { code: 'unknown_serial' } });
      }
      const from = unit.state;
      const t = repairTransition(serial, from as UnitStateName, dto.action);
      if (!t.ok) {
        throw new ConflictException({ message: t.message, details: { code: 'bad_repair_transition', state: from, allowed: t.allowed } });
      }
      await this.refuseIfUnderTest(em, unit);
      const cause = withRecord ? await activeCause(em, dto.causeId!) : null;

      const before = snapshot(unit);
      unit.state = t.to as UnitState;
      // a returned unit starts a fresh set of attempts; run attempt numbers stay global
      if (dto.action === 'return') {
        unit.testCountAtReturn = unit.testCount;
        unit.sentToRepairAt = undefined;
      }
      let record: RepairRecord | null = null;
      if (cause) {
        const [lastFail] = await em.execute<{ id: number }[]>(
          "select id from test_runs where unit_id = ? and verdict = 'fail' order by finished_at desc, id desc limit 1",
          [unit.id],
        );
        record = em.create(RepairRecord, {
          unit,
          cause,
          symptom: dto.symptom!,
          actionTaken: dto.actionTaken!,
          disposition: dto.action === 'scrap' ? RepairDisposition.Scrapped : RepairDisposition.Retest,
          technician: em.getReference(User, actorId),
          recordedAt: new Date(),
          failedRun: lastFail ? em.getReference(TestRun, Number(lastFail.id)) : undefined,
        });
        em.persist(record);
        // the record's id goes into the audit event
        await em.flush();
      }
      const event = await this.audit.record(
        {
          actor: actorId,
          action: REPAIR_AUDIT_ACTIONS[dto.action],
          entityType: 'unit',
          entityId: unit.id,
          reason: dto.note ?? record?.actionTaken,
          before,
          after: {
            ...snapshot(unit),
            ...(record && cause ? { repairRecord: recordForAudit({ ...record, causeId: cause.id, causeName: cause.name }) } : {}),
          },
        },
        em,
      );
      await em.flush();
      return {
        action: dto.action,
        fromState: from,
        toState: unit.state,
        auditEventId: event.id,
        unit: toUnitDto(unit),
        record: record ? await this.records.one(em, record.id) : null,
      };
    });
  }

  /**
   * The operator sends a failed unit to repair although it has attempts left (retest policy, issue 8): it
   * goes on the repair queue and its station no longer offers a retest. Audited with the note. Sending a
   * unit that was already sent changes nothing (a double click is not an error).
   */
  async sendToRepair(rawSerial: string, dto: SendToRepairDto, actorId: number): Promise<UnitDto> {
    const serial = checkedSerial(rawSerial);
    return this.em.fork().transactional(async (em) => {
      const unit = await em.findOne(Unit, { serial }, { populate: ['lot', 'product'] });
      if (!unit) {
        throw new NotFoundException({ message: `No unit with serial "${serial}" is registered. Check the label.`, details: { code: 'unknown_serial' } });
      }
      if (unit.state !== UnitState.Failed) {
        const why: Record<string, string> = {
          untested: 'it has not been tested yet',
          passed: 'it passed its test',
          in_repair: 'it is already in repair',
          scrapped: 'it was scrapped',
        };
        throw new ConflictException({
          message: `${serial} cannot be sent to repair: ${why[unit.state] ?? `it is ${unit.state}`}. Only a failed unit goes to repair.`,
          details: { code: 'not_failed', state: unit.state },
        });
      }
      await this.refuseIfUnderTest(em, unit);
      if (unit.sentToRepairAt) return toUnitDto(unit);
      const before = snapshot(unit);
      unit.sentToRepairAt = new Date();
      await this.audit.record(
        {
          actor: actorId,
          action: 'unit.sent_to_repair',
          entityType: 'unit',
          entityId: unit.id,
          reason: dto.note || undefined,
          before,
          after: snapshot(unit),
        },
        em,
      );
      await em.flush();
      return toUnitDto(unit);
    });
  }

  /** A unit on a fixture right now keeps its state until the run ends (the run would overwrite it). */
  private async refuseIfUnderTest(em: EntityManager, unit: Unit): Promise<void> {
    const running = await em.find(TestRun, { unit: unit.id, verdict: RunVerdict.Running }, { populate: ['station'] });
    // a row left 'running' by a crash is not a live run: only the engine's own active run counts
    const live = running.find((r) => this.engine.activeRunOn(r.station.id)?.runId === r.id);
    if (live) {
      throw new ConflictException({
        message: `${unit.serial} is being tested on station ${live.station.code} right now; wait for the run to finish.`,
        details: { code: 'unit_under_test', runId: live.id },
      });
    }
  }
}

/** Receiving a unit writes no record: record fields sent with it are refused, never silently dropped. */
function refuseRecordFields(dto: RepairActionDto): void {
  const sent = (['symptom', 'causeId', 'actionTaken'] as const).filter((k) => dto[k] !== undefined);
  if (sent.length === 0) return;
  throw new BadRequestException({
    message: `A repair record is written when the unit is returned for retest or scrapped; receiving it takes a note only. Leave out ${sent.join(', ')}.`,
    details: sent.map((field) => ({ field, problems: [`${field} belongs to return or scrap, not to ${dto.action}`] })),
  });
}

function checkedSerial(raw: string): string {
  const serial = raw.trim();
  if (serial.length === 0 || serial.length > MAX_SERIAL_LENGTH) {
    throw new BadRequestException({
      message: `A serial has 1 to ${MAX_SERIAL_LENGTH} characters; got ${serial.length}.`,
      details: [{ field: 'serial', problems: [`serial must have 1 to ${MAX_SERIAL_LENGTH} characters`] }],
    });
  }
  return serial;
}

function snapshot(u: Unit): { serial: string; state: string; testCount: number; testCountAtReturn: number; sentToRepairAt: string | null } {
  return { serial: u.serial, state: u.state, testCount: u.testCount, testCountAtReturn: u.testCountAtReturn, sentToRepairAt: u.sentToRepairAt?.toISOString() ?? null };
}
