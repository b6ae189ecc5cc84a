import { capitalise, diffWords, fieldWords, valueWords, type AuditChange } from './audit-fields';

/**
 * THE table of audit action codes in plain words. Every code the application writes has a phrase here; a
 * code that is missing (a feature added later) gets a generic phrase from its parts, never the bare code.
 * Add a new code here together with the feature that writes it.
 */

/** What one audit record is about, as the list query gathers it. */
export interface AuditFacts {
  action: string;
  entityType: string;
  entityId: string | null;
  actorName: string | null;
  reason: string | null;
  before: Record<string, unknown> | null;
  after: Record<string, unknown> | null;
  /** The object's own name when it is known (plan code and version, fixture code, user name, lot code, serial) */
  label?: string | null;
  /** Names and units of a plan version's steps and limits, to put limit changes into words */
  plan?: PlanNames | null;
}

export interface PlanNames {
  steps: ReadonlyMap<string, { name: string; limits: ReadonlyMap<string, { name: string; unit: string }> }>;
}

export interface AuditDescription {
  /** One sentence: what happened to which object */
  what: string;
  /** Each changed field with its old and new value, in words */
  changes: AuditChange[];
}

type Phrase = (f: AuditFacts) => string;

const str = (v: unknown): string | null => (typeof v === 'string' && v.length > 0 ? v : typeof v === 'number' ? String(v) : null);
const pick = (f: AuditFacts, key: string): unknown => f.after?.[key] ?? f.before?.[key];

/** "OB-BK0503-EOL version 4" from the record, else the looked-up label, else the id. */
function planVersionName(f: AuditFacts): string {
  const plan = str(pick(f, 'plan'));
  const version = str(pick(f, 'version'));
  if (plan && version) return `${plan} version ${version}`;
  return f.label ?? `plan version #${f.entityId ?? '?'}`;
}

function named(f: AuditFacts, kind: string, ...keys: string[]): string {
  for (const k of keys) {
    const v = str(pick(f, k));
    if (v) return `${kind} ${v}`;
  }
  if (f.label) return `${kind} ${f.label}`;
  return f.entityId ? `${kind} #${f.entityId}` : kind;
}

const unitName = (f: AuditFacts) => named(f, 'unit', 'serial');
const fixtureName = (f: AuditFacts) => named(f, 'fixture', 'code');
const userName = (f: AuditFacts) => named(f, 'user', 'username');
const runName = (f: AuditFacts) => {
  const serial = str(pick(f, 'serial'));
  return `run #${f.entityId ?? '?'}${serial ? ` of unit ${serial}` : ''}`;
};

export const ACTION_WORDS: Readonly<Record<string, Phrase>> = {
  // plans and limits
  'plan_version.created': (f) => {
    const from = str(f.after?.startedFrom);
    return `Started ${planVersionName(f)} as a draft${from ? ` from version ${from}` : ''}`;
  },
  'plan_version.imported': (f) => `Imported ${planVersionName(f)} from the plan file${str(f.after?.file) ? ` ${str(f.after?.file)}` : ''}`,
  'plan_version.edited': (f) => editedPhrase(f),
  'plan_version.submitted': (f) => `Submitted ${planVersionName(f)} for release`,
  'plan_version.released': (f) => `Released plan ${planVersionName(f)}`,
  'plan_version.retired': (f) => `Retired plan ${planVersionName(f)}`,
  'plan_version.discarded': (f) => `Discarded the draft ${planVersionName(f)}`,
  // users and sign-in
  'user.created': (f) => `Created ${userName(f)}`,
  'user.updated': (f) => `Changed ${userName(f)}`,
  'user.deactivated': (f) => `Deactivated ${userName(f)}`,
  'user.reactivated': (f) => `Reactivated ${userName(f)}`,
  'user.password_reset': (f) => `Reset the password of ${userName(f)}`,
  'auth.login': (f) => `Signed in${f.actorName ? ` as ${f.actorName}` : ''}`,
  'auth.login_failed': (f) => `Refused a sign-in${f.actorName ? ` as "${f.actorName}"` : ''}`,
  'auth.board_token_issued': (f) => `Issued a board display link${str(f.after?.label) ? ` "${str(f.after?.label)}"` : ''}`,
  // fixtures and calibration
  'fixture.created': (f) => `Added ${fixtureName(f)}`,
  'fixture.updated': (f) => `Changed ${fixtureName(f)}`,
  'fixture.calibrated': (f) => {
    const due = valueWords(f.after?.calibrationDueAt);
    return `Recorded a calibration of ${fixtureName(f)}${due ? `, next due ${due}` : ''}`;
  },
  'fixture.contacts_replaced': (f) => `Reset the contact count of ${fixtureName(f)} after a probe change`,
  // master data
  'station.created': (f) => `Added ${named(f, 'station', 'code')}`,
  'station.updated': (f) => `Changed ${named(f, 'station', 'code')}`,
  'product.created': (f) => `Added ${named(f, 'product', 'partNumber')}`,
  'product.updated': (f) => `Changed ${named(f, 'product', 'partNumber')}`,
  // lots
  'lot.created': (f) => {
    const qty = str(f.after?.plannedQuantity);
    return `Created ${named(f, 'lot', 'code')}${qty ? ` for ${qty} units` : ''}`;
  },
  'lot.released': (f) => `Released ${named(f, 'lot', 'code')}`,
  'lot.closed': (f) => `Closed ${named(f, 'lot', 'code')}`,
  // units and repair
  'unit.sent_to_repair': (f) => `Sent ${unitName(f)} to repair`,
  'unit.repair_received': (f) => `Received ${unitName(f)} in repair`,
  'unit.repair_returned': (f) => `Returned ${unitName(f)} from repair for retest`,
  'unit.scrapped': (f) => `Scrapped ${unitName(f)}`,
  // limits from characterization data
  'characterization.uploaded': (f) => {
    const n = str(f.after?.units);
    return `Uploaded the characterization data set ${str(f.after?.name) ?? `#${f.entityId ?? '?'}`}${n ? ` (${n} units)` : ''}`;
  },
  'characterization.limits_accepted': (f) => {
    const set = f.after?.dataSet as Record<string, unknown> | undefined;
    const name = str(set?.name);
    return `Put limits from the data set ${name ?? `#${f.entityId ?? '?'}`} into ${planVersionName(f)}${str(f.after?.step) ? `, step ${str(f.after?.step)}` : ''}`;
  },
  // holds and alerts
  'hold_rule.created': (f) => `Added a hold rule${str(f.after?.partNumber) ? ` for ${str(f.after?.partNumber)}` : ''}`,
  'hold_rule.switched_off': () => 'Switched a hold rule off',
  'hold_rule.switched_on': () => 'Switched a hold rule on again',
  'hold.placed': (f) => `Put ${named(f, 'lot', 'lotCode')} on hold${str(f.after?.holdReason) ? `: ${str(f.after?.holdReason)}` : ''}`,
  'hold.lifted': (f) => `Lifted the hold on ${named(f, 'lot', 'lotCode')}`,
  // repair causes and records
  'repair_cause.created': (f) => `Added the repair cause "${str(f.after?.name) ?? '?'}"`,
  'repair_cause.renamed': (f) => `Renamed the repair cause "${str(f.before?.name) ?? '?'}" to "${str(f.after?.name) ?? '?'}"`,
  'repair_cause.switched_off': (f) => `Switched the repair cause "${str(pick(f, 'name')) ?? '?'}" off`,
  'repair_cause.switched_on': (f) => `Switched the repair cause "${str(pick(f, 'name')) ?? '?'}" on again`,
  'repair_cause.deleted': (f) => `Deleted the unused repair cause "${str(f.before?.name) ?? '?'}"`,
  'unit.repair_record_corrected': (f) => `Corrected a repair record of ${unitName(f)} with a new record`,
  // runs
  'run.safety_confirmed': (f) => `Confirmed it is safe to power ${runName(f)}`,
  'run.retest_override': (f) => `Allowed an extra attempt${str(f.after?.attempt) ? ` (attempt ${str(f.after?.attempt)})` : ''} for ${unitName(f)}`,
  'run.interrupted': (f) => `Closed ${runName(f)} as interrupted`,
};

/** Object types in words, for the generic phrase and the filter choices. */
export const ENTITY_TYPE_WORDS: Readonly<Record<string, string>> = {
  plan: 'plan',
  plan_version: 'plan version',
  limit: 'limit',
  fixture: 'fixture',
  calibration: 'calibration',
  user: 'user',
  lot: 'lot',
  unit: 'unit',
  hold: 'hold',
  hold_rule: 'hold rule',
  repair_cause: 'repair cause',
  characterization: 'characterization data',
  station: 'station',
  product: 'product',
  test_run: 'run',
  board_display: 'board display',
};

/** "hold_rule.threshold_changed" on hold_rule 3 → "Threshold changed: hold rule #3". */
export function genericPhrase(f: AuditFacts): string {
  const verb = f.action.includes('.') ? f.action.slice(f.action.indexOf('.') + 1) : f.action;
  const type = ENTITY_TYPE_WORDS[f.entityType] ?? f.entityType.replace(/_/g, ' ');
  const object = f.label ? `${type} ${f.label}` : f.entityId ? `${type} #${f.entityId}` : type;
  return `${capitalise(verb.replace(/[_.]/g, ' '))}: ${object}`;
}

/** The sentence for a record: from the table, or the generic phrase for a code the table does not know. */
export function describeAudit(f: AuditFacts): AuditDescription {
  const phrase = ACTION_WORDS[f.action];
  const what = phrase ? phrase(f) : genericPhrase(f);
  if (f.action === 'plan_version.edited') {
    // settings changes are in `changes` and in the before/after summary: list them once
    const skip = new Set([...PLAN_EDIT_SKIP, ...planEditChanges(f).filter((c) => !c.step).map((c) => c.field)]);
    return { what, changes: [...planChanges(f), ...diffWords(f.before, f.after, skip)] };
  }
  return { what, changes: diffWords(f.before, f.after, f.before && f.after ? NOTHING : ALWAYS_SKIP) };
}

const NOTHING: ReadonlySet<string> = new Set();
// on a record with one side only, the id repeats the link and says nothing
const ALWAYS_SKIP: ReadonlySet<string> = new Set(['id']);
const PLAN_EDIT_SKIP: ReadonlySet<string> = new Set(['changes', 'added', 'removed', 'submissionWithdrawn', 'plan', 'version']);

interface PlanEditChange {
  step?: string;
  field: string;
  before: unknown;
  after: unknown;
}

const LIMIT_FIELD = /^limits\[([^\]]+)\](?:\.(\w+))?$/;
const LIMIT_PROP_WORDS: Record<string, string> = { low: 'low limit', high: 'high limit', uncertainty: 'stated uncertainty', rule: 'decision rule', name: 'name', unit: 'unit' };

function planEditChanges(f: AuditFacts): PlanEditChange[] {
  const raw = f.after?.changes;
  return Array.isArray(raw) ? raw.filter((c): c is PlanEditChange => !!c && typeof c === 'object' && typeof (c as PlanEditChange).field === 'string') : [];
}

/** One change of a plan edit in words: field label and the two values with their units. */
function planChangeWords(f: AuditFacts, c: PlanEditChange): AuditChange {
  const step = c.step ? f.plan?.steps.get(c.step) : undefined;
  const stepName = step?.name ?? c.step ?? '';
  const m = LIMIT_FIELD.exec(c.field);
  if (m) {
    const [, key, prop] = m;
    const limit = step?.limits.get(key);
    const limitName = limit?.name ?? `${key}${stepName ? ` (${stepName})` : ''}`;
    const unit = prop === 'low' || prop === 'high' || prop === 'uncertainty' ? (limit?.unit ?? null) : null;
    if (!prop) {
      return { field: `Limit ${limitName}`, before: c.before ? 'present' : null, after: c.after ? 'present' : null };
    }
    return { field: `${capitalise(LIMIT_PROP_WORDS[prop] ?? fieldWords(prop).words)} of ${limitName}`, before: valueWords(c.before, unit), after: valueWords(c.after, unit) };
  }
  if (c.field.startsWith('params.')) {
    const fw = fieldWords(c.field.slice('params.'.length));
    return { field: `${capitalise(fw.words)} of step ${stepName}`, before: valueWords(c.before, fw.unit), after: valueWords(c.after, fw.unit) };
  }
  const fw = fieldWords(c.field);
  return { field: stepName ? `${capitalise(fw.words)} of step ${stepName}` : capitalise(fw.words), before: valueWords(c.before, fw.unit), after: valueWords(c.after, fw.unit) };
}

function planChanges(f: AuditFacts): AuditChange[] {
  const out = planEditChanges(f).map((c) => planChangeWords(f, c));
  const steps = (v: unknown) => (Array.isArray(v) ? v.map(String) : []);
  for (const key of steps(f.after?.added)) out.push({ field: 'Step added', before: null, after: f.plan?.steps.get(key)?.name ?? key });
  for (const key of steps(f.after?.removed)) out.push({ field: 'Step removed', before: key, after: null });
  return out;
}

/** "Changed the high limit of Output voltage at 1.5 A from 3.35 V to 3.36 V" for a single change; a count otherwise. */
function editedPhrase(f: AuditFacts): string {
  const changes = planChanges(f);
  if (changes.length === 1) {
    const c = changes[0];
    if (c.before !== null && c.after !== null) {
      const field = c.field[0].toLowerCase() + c.field.slice(1);
      return `Changed the ${field} in ${planVersionName(f)} from ${c.before} to ${c.after}`;
    }
  }
  const n = changes.length;
  return n === 0 ? `Edited the draft ${planVersionName(f)}` : `Edited the draft ${planVersionName(f)}: ${n} change${n === 1 ? '' : 's'}`;
}
