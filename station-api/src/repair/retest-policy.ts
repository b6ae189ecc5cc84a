/** Why a unit is on the repair queue. */
export type RepairQueueReason = 'no_attempts_left' | 'sent_by_operator' | 'in_repair';

export interface RetestUnit {
  state: string;
  testCount: number;
  /** testCount when repair last returned the unit (its attempts count from there) */
  testCountAtReturn: number;
  sentToRepairAt?: Date | null;
}

/** Attempts the unit has used since it was registered or last came back from repair. */
export function attemptsUsed(u: RetestUnit): number {
  return u.testCount - u.testCountAtReturn;
}

/**
 * The retest policy (issue 8): after a FAIL with attempts left the unit stays `failed` and may be re-seated
 * and tested again; it belongs on the repair queue only when it has no attempts left, when the operator sent
 * it, or while it is in repair. Returns why it is on the queue, or null when it is not.
 * @param maxAttempts the plan's attempts per unit (of the plan version the unit last failed on)
 */
export function repairQueueReason(u: RetestUnit, maxAttempts: number): RepairQueueReason | null {
  if (u.state === 'in_repair') return 'in_repair';
  if (u.state !== 'failed') return null;
  if (attemptsUsed(u) >= maxAttempts) return 'no_attempts_left';
  if (u.sentToRepairAt) return 'sent_by_operator';
  return null;
}
