import { describe, expect, it } from 'vitest';
import { attemptsUsed, repairQueueReason } from './retest-policy';

// The policy as stated in issue 8 ("A retest policy the operator can see"); self-constructed examples.
describe('repairQueueReason', () => {
  const failed = { state: 'failed', testCount: 1, testCountAtReturn: 0 };

  it('keeps a failed unit with attempts left off the queue', () => {
    expect(repairQueueReason(failed, 3)).toBeNull();
    expect(repairQueueReason({ ...failed, testCount: 2 }, 3)).toBeNull();
  });

  it('puts it on the queue when no attempts are left, or when the operator sent it', () => {
    expect(repairQueueReason({ ...failed, testCount: 3 }, 3)).toBe('no_attempts_left');
    expect(repairQueueReason({ ...failed, sentToRepairAt: new Date() }, 3)).toBe('sent_by_operator');
    expect(repairQueueReason({ ...failed, testCount: 1 }, 1)).toBe('no_attempts_left');
  });

  it('counts attempts from the last return from repair', () => {
    const returned = { state: 'failed', testCount: 4, testCountAtReturn: 3 };
    expect(attemptsUsed(returned)).toBe(1);
    expect(repairQueueReason(returned, 3)).toBeNull();
    expect(repairQueueReason({ ...returned, testCount: 6 }, 3)).toBe('no_attempts_left');
  });

  it('lists units in repair, and never a passed, untested or scrapped unit', () => {
    expect(repairQueueReason({ ...failed, state: 'in_repair' }, 3)).toBe('in_repair');
    for (const state of ['passed', 'untested', 'scrapped']) expect(repairQueueReason({ ...failed, state, testCount: 9, sentToRepairAt: new Date() }, 3)).toBeNull();
  });
});
