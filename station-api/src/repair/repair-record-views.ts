import type { RepairRecordDto } from './dto/repair-record.dto';

/**
 * Repair records read with hand-written SQL (no hydration): the columns a RepairRecordDto shows, the cause's
 * name and the technician's display name (never a password hash).
 */
export const RECORD_VIEW_SELECT =
  'select rr.id, rr.unit_id, u.serial, rr.symptom, rr.cause_id, c.name as cause_name, rr.action_taken, rr.disposition, ' +
  'rr.technician_id, t.display_name as technician_name, rr.recorded_at, rr.failed_run_id, rr.corrects_id, rr.correction_reason, ' +
  '(select max(x.id) from repair_records x where x.corrects_id = rr.id) as corrected_by_id ' +
  'from repair_records rr join units u on u.id = rr.unit_id join repair_causes c on c.id = rr.cause_id join users t on t.id = rr.technician_id';

const idOrNull = (v: unknown) => (v === null || v === undefined ? null : Number(v));

/** One row of {@link RECORD_VIEW_SELECT} as the record every route shows; dates are stored as epoch ms. */
export function rowToRecord(row: Record<string, unknown>): RepairRecordDto {
  const at = row.recorded_at;
  return {
    id: Number(row.id),
    unitId: Number(row.unit_id),
    serial: String(row.serial),
    symptom: String(row.symptom),
    cause: { id: Number(row.cause_id), name: String(row.cause_name) },
    actionTaken: String(row.action_taken),
    disposition: row.disposition as RepairRecordDto['disposition'],
    technician: { id: Number(row.technician_id), displayName: String(row.technician_name) },
    recordedAt: new Date(typeof at === 'string' && !/^\d+$/.test(at) ? at : Number(at)).toISOString(),
    failedRunId: idOrNull(row.failed_run_id),
    correctsId: idOrNull(row.corrects_id),
    correctionReason: row.correction_reason === null || row.correction_reason === undefined ? null : String(row.correction_reason),
    correctedById: idOrNull(row.corrected_by_id),
  };
}

/** What the audit event of a repair step carries in `after.repairRecord` (interfaces fact 4). */
export function recordForAudit(r: { id: number; symptom: string; causeId: number; causeName: string; actionTaken: string; disposition: string; correctsId?: number | null }) {
  return {
    id: r.id,
    symptom: r.symptom,
    causeId: r.causeId,
    cause: r.causeName,
    action: r.actionTaken,
    disposition: r.disposition,
    ...(r.correctsId ? { correctsId: r.correctsId } : {}),
  };
}
