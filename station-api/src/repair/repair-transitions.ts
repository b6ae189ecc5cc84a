/**
 * The repair loop as a table: which repair action moves a unit from which state to which. Plain data and
 * functions (no Nest, no database) so the rules can be read and tested on their own.
 *
 *   failed ──receive──▶ in_repair ──return──▶ untested (tested again, with a fresh set of attempts)
 *   failed | in_repair ──scrap──▶ scrapped (final)
 */

export const REPAIR_ACTIONS = ['receive', 'return', 'scrap'] as const;
export type RepairAction = (typeof REPAIR_ACTIONS)[number];

/** Unit states as stored (mirrors `UnitState` values; kept as strings so this file needs no entity). */
export type UnitStateName = 'untested' | 'passed' | 'failed' | 'in_repair' | 'scrapped';

interface Transition {
  from: readonly UnitStateName[];
  to: UnitStateName;
  /** Past tense for messages and the audit action name */
  done: string;
}

export const REPAIR_TRANSITIONS: Readonly<Record<RepairAction, Transition>> = Object.freeze({
  receive: { from: ['failed'], to: 'in_repair', done: 'received into repair' },
  return: { from: ['in_repair'], to: 'untested', done: 'returned for retest' },
  scrap: { from: ['failed', 'in_repair'], to: 'scrapped', done: 'scrapped' },
});

/** Audit action names, one per repair action. */
export const REPAIR_AUDIT_ACTIONS: Readonly<Record<RepairAction, string>> = Object.freeze({
  receive: 'unit.repair_received',
  return: 'unit.repair_returned',
  scrap: 'unit.scrapped',
});

const STATE_WORDS: Record<UnitStateName, string> = {
  untested: 'untested',
  passed: 'passed',
  failed: 'failed and waiting for repair',
  in_repair: 'in repair',
  scrapped: 'scrapped',
};

const ACTION_WORDS: Record<RepairAction, string> = {
  receive: 'receive it into repair',
  return: 'return it for retest',
  scrap: 'scrap it',
};

/** The repair actions allowed from a state, in table order. */
export function allowedActions(state: UnitStateName): RepairAction[] {
  return REPAIR_ACTIONS.filter((a) => REPAIR_TRANSITIONS[a].from.includes(state));
}

/** Outcome of asking for a repair action: the new state, or a sentence saying why not and what is allowed. */
export type TransitionResult = { ok: true; to: UnitStateName } | { ok: false; message: string; allowed: RepairAction[] };

/**
 * Decides a repair action against the unit's current state.
 * @param serial only used in the refusal message
 */
export function repairTransition(serial: string, state: UnitStateName, action: RepairAction): TransitionResult {
  const t = REPAIR_TRANSITIONS[action];
  if (t.from.includes(state)) return { ok: true, to: t.to };
  const allowed = allowedActions(state);
  const what = allowed.length > 0 ? `From ${STATE_WORDS[state]} you can ${allowed.map((a) => ACTION_WORDS[a]).join(' or ')}.` : notInLoop(state);
  return {
    ok: false,
    allowed,
    message: `${serial} is ${STATE_WORDS[state]}, so it cannot be ${t.done}. ${what}`,
  };
}

function notInLoop(state: UnitStateName): string {
  if (state === 'scrapped') return 'A scrapped unit stays scrapped; no repair action applies.';
  return 'Only failed units and units in repair take repair actions.';
}
