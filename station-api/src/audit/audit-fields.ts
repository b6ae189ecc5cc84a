/**
 * Before/after of an audit record in words: readable field names with their units kept, values formatted
 * for people (dates, yes/no, lists). Pure functions; no Nest, no database.
 */

/** One changed field, ready to show: "High limit of Output voltage: 3.35 V → 3.36 V". */
export interface AuditChange {
  field: string;
  before: string | null;
  after: string | null;
}

/** Field names whose camelCase split alone would read badly. */
const FIELD_WORDS: Readonly<Record<string, string>> = {
  displayName: 'display name',
  username: 'sign-in name',
  roles: 'roles',
  active: 'active',
  state: 'state',
  stage: 'stage',
  checksum: 'checksum',
  stepCount: 'number of steps',
  stopAtFirstFailure: 'stop at first failure',
  maxAttempts: 'attempts allowed',
  startedFrom: 'started from version',
  portPath: 'port',
  baudRate: 'baud rate',
  commandTimeoutMs: 'command timeout',
  calibratedAt: 'calibrated on',
  calibrationDueAt: 'calibration due',
  calibrationCertificate: 'calibration certificate',
  calibrationOverdue: 'calibration overdue',
  contactCyclesUsed: 'contact cycles used',
  contactCyclesAllowed: 'contact cycles allowed',
  contactCyclesRemaining: 'contact cycles left',
  plannedQuantity: 'planned quantity',
  productId: 'product',
  fixtureId: 'fixture id',
  fixtureCode: 'fixture',
  activeLotId: 'active lot id',
  activeLotCode: 'active lot',
  testCount: 'attempts used',
  testCountAtReturn: 'attempts used when returned',
  sentToRepairAt: 'sent to repair',
  partNumber: 'part number',
  serialPattern: 'serial format',
  firstSerial: 'first serial',
  lastSerial: 'last serial',
  expiresAt: 'expires',
  releasedVersions: 'released versions',
  changeReason: 'change reason',
  superseded: 'superseded versions',
  submissionWithdrawn: 'submission withdrawn',
  fileRevision: 'file revision',
  endReason: 'end reason',
  holdReason: 'hold reason',
  symptom: 'symptom',
  cause: 'cause',
  action: 'action',
};

/** Unit suffixes of field names (house style: units in names), longest first so `MvPp` wins over `V`. */
const UNIT_SUFFIXES: readonly [suffix: string, unit: string][] = [
  ['MvPp', 'mV p-p'],
  ['Pct', '%'],
  ['Ms', 'ms'],
  ['Mv', 'mV'],
  ['Hz', 'Hz'],
  ['V', 'V'],
  ['A', 'A'],
];

/** `voltageUncertaintyV` → `{ words: 'voltage uncertainty', unit: 'V' }`. */
export function fieldWords(key: string): { words: string; unit: string | null } {
  if (FIELD_WORDS[key]) {
    const unit = key.endsWith('Ms') ? 'ms' : null;
    return { words: FIELD_WORDS[key], unit };
  }
  let base = key;
  let unit: string | null = null;
  for (const [suffix, u] of UNIT_SUFFIXES) {
    // only a suffix after a lower-case letter is a unit (`loadA`, not `A` alone or `DATA`)
    if (key.length > suffix.length && key.endsWith(suffix) && /[a-z0-9]/.test(key[key.length - suffix.length - 1])) {
      base = key.slice(0, -suffix.length);
      unit = u;
      break;
    }
  }
  const words = base
    .replace(/([a-z0-9])([A-Z])/g, '$1 $2')
    .replace(/_/g, ' ')
    .toLowerCase();
  return { words, unit };
}

const ISO_INSTANT = /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(:\d{2}(\.\d+)?)?(Z|[+-]\d{2}:\d{2})$/;

/** An instant as `2026-12-02 14:05 UTC` (the audit trail is read across shifts and sites: one clock). */
export function instantWords(iso: string): string {
  const d = new Date(iso);
  if (Number.isNaN(d.getTime())) return iso;
  return `${d.toISOString().slice(0, 16).replace('T', ' ')} UTC`;
}

/** A value in words, with its unit when the field name carries one. */
export function valueWords(value: unknown, unit: string | null = null): string | null {
  if (value === undefined || value === null) return null;
  if (typeof value === 'boolean') return value ? 'yes' : 'no';
  if (typeof value === 'number') return unit ? `${value} ${unit}` : String(value);
  if (typeof value === 'string') return ISO_INSTANT.test(value) ? instantWords(value) : value;
  if (value instanceof Date) return instantWords(value.toISOString());
  if (Array.isArray(value)) {
    if (value.length === 0) return '(none)';
    return value.map((v) => valueWords(v, unit) ?? '(none)').join(', ');
  }
  // a nested record: its fields in words, one after another
  return Object.entries(value as Record<string, unknown>)
    .map(([k, v]) => {
      const f = fieldWords(k);
      return `${f.words}: ${valueWords(v, f.unit) ?? '(none)'}`;
    })
    .join('; ');
}

// code-valued fields whose values read as words once the underscores go (in_repair → in repair)
const CODE_FIELDS = new Set(['state', 'stage', 'verdict', 'endReason', 'rule']);

const sameValue = (a: unknown, b: unknown) => JSON.stringify(a ?? null) === JSON.stringify(b ?? null);

/**
 * The fields that differ between `before` and `after`, in words. A record that only has `after` (something
 * created) lists what it was created with; one that only has `before` (something removed) lists what it held.
 * `skip` names fields another part of the description already explains.
 */
export function diffWords(
  before: Record<string, unknown> | null | undefined,
  after: Record<string, unknown> | null | undefined,
  skip: ReadonlySet<string> = new Set(),
): AuditChange[] {
  const keys = [...new Set([...Object.keys(before ?? {}), ...Object.keys(after ?? {})])].filter((k) => !skip.has(k));
  const out: AuditChange[] = [];
  for (const k of keys) {
    const b = before?.[k];
    const a = after?.[k];
    if (before && after && sameValue(b, a)) continue;
    const f = fieldWords(k);
    // with both sides recorded, an empty value is a value ("none"), not a missing side
    const both = !!before && !!after;
    const words = (v: unknown) => {
      if (CODE_FIELDS.has(k) && typeof v === 'string') return v.replace(/_/g, ' ');
      // a checksum is recognised by its start; the full value stays in the record's before/after
      if (k === 'checksum' && typeof v === 'string' && v.length > 12) return `${v.slice(0, 12)}…`;
      return valueWords(v, f.unit) ?? (both ? '(none)' : null);
    };
    out.push({ field: capitalise(f.words), before: before ? words(b) : null, after: after ? words(a) : null });
  }
  return out;
}

export function capitalise(s: string): string {
  return s.length === 0 ? s : s[0].toUpperCase() + s.slice(1);
}
