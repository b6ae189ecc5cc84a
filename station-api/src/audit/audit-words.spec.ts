import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { diffWords, fieldWords, valueWords } from './audit-fields';
import { ACTION_WORDS, describeAudit, genericPhrase, type AuditFacts } from './audit-words';

const facts = (over: Partial<AuditFacts>): AuditFacts => ({ action: 'x.y', entityType: 'unit', entityId: '1', actorName: 'engineer', reason: null, before: null, after: null, ...over });

function sources(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const p = join(dir, name);
    if (statSync(p).isDirectory()) return name === 'migrations' ? [] : sources(p);
    return p.endsWith('.ts') && !p.endsWith('.spec.ts') ? [p] : [];
  });
}

describe('audit action words', () => {
  it('has a phrase for every action code the application writes', () => {
    // every `action: 'a.b'` literal, the repair action map and the user update variants (self-constructed check)
    const codes = new Set<string>();
    for (const file of sources(join(__dirname, '..'))) {
      const text = readFileSync(file, 'utf8');
      for (const m of text.matchAll(/action: '([a-z_]+\.[a-z_.]+)'/g)) codes.add(m[1]);
      for (const m of text.matchAll(/(?:receive|return|scrap): '([a-z_]+\.[a-z_]+)'/g)) codes.add(m[1]);
      for (const m of text.matchAll(/return '(user\.[a-z_]+)'/g)) codes.add(m[1]);
    }
    expect(codes.size).toBeGreaterThan(20);
    const missing = [...codes].filter((c) => !ACTION_WORDS[c]);
    expect(missing).toEqual([]);
  });

  it('puts a single limit change into one sentence with the limit name and units', () => {
    const plan = { steps: new Map([['vout-load', { name: 'Output voltage at load', limits: new Map([['voutV@1.5', { name: 'Output voltage at 1.5 A', unit: 'V' }]]) }]]) };
    const d = describeAudit(
      facts({
        action: 'plan_version.edited',
        entityType: 'plan_version',
        before: { plan: 'EOL-BK3305', version: 4 },
        after: { plan: 'EOL-BK3305', version: 4, changes: [{ step: 'vout-load', field: 'limits[voutV@1.5].high', before: 3.35, after: 3.36 }], added: [], removed: [] },
        plan,
      }),
    );
    expect(d.what).toBe('Changed the high limit of Output voltage at 1.5 A in EOL-BK3305 version 4 from 3.35 V to 3.36 V');
    expect(d.changes).toEqual([{ field: 'High limit of Output voltage at 1.5 A', before: '3.35 V', after: '3.36 V' }]);
  });

  it('counts several changes and names step parameters with their units', () => {
    const d = describeAudit(
      facts({
        action: 'plan_version.edited',
        entityType: 'plan_version',
        before: { plan: 'P', version: 2, maxAttempts: 3 },
        after: {
          plan: 'P',
          version: 2,
          maxAttempts: 2,
          changes: [
            { step: 'ripple', field: 'params.settleMs', before: 50, after: 80 },
            { field: 'maxAttempts', before: 3, after: 2 },
          ],
          added: ['new-step'],
          removed: [],
        },
      }),
    );
    expect(d.what).toBe('Edited the draft P version 2: 3 changes');
    expect(d.changes).toEqual([
      { field: 'Settle of step ripple', before: '50 ms', after: '80 ms' },
      { field: 'Attempts allowed', before: '3', after: '2' },
      { field: 'Step added', before: null, after: 'new-step' },
    ]);
  });

  it('uses a generic phrase for codes it does not know, never the bare code', () => {
    expect(genericPhrase(facts({ action: 'hold.lifted', entityType: 'hold', entityId: '3' }))).toBe('Lifted: hold #3');
    expect(describeAudit(facts({ action: 'hold_rule.threshold_changed', entityType: 'hold_rule', entityId: '9', label: null })).what).toBe('Threshold changed: hold rule #9');
  });

  it('names things from the record or the looked-up label', () => {
    expect(describeAudit(facts({ action: 'unit.scrapped', after: { serial: 'K5A-2649-00017' } })).what).toBe('Scrapped unit K5A-2649-00017');
    expect(describeAudit(facts({ action: 'fixture.contacts_replaced', entityType: 'fixture', label: 'FX-101' })).what).toBe('Reset the contact count of fixture FX-101 after a probe change');
    expect(describeAudit(facts({ action: 'fixture.calibrated', entityType: 'fixture', after: { code: 'FX-101', calibrationDueAt: '2027-06-01T00:00:00.000Z' } })).what).toBe(
      'Recorded a calibration of fixture FX-101, next due 2027-06-01 00:00 UTC',
    );
  });
});

describe('audit fields in words', () => {
  it('keeps units from the field name and makes names readable', () => {
    expect(fieldWords('voltageUncertaintyV')).toEqual({ words: 'voltage uncertainty', unit: 'V' });
    expect(fieldWords('rippleMvPp')).toEqual({ words: 'ripple', unit: 'mV p-p' });
    expect(fieldWords('efficiencyPct')).toEqual({ words: 'efficiency', unit: '%' });
    expect(fieldWords('calibrationDueAt')).toEqual({ words: 'calibration due', unit: null });
    expect(valueWords(0.005, 'V')).toBe('0.005 V');
    expect(valueWords(true)).toBe('yes');
    expect(valueWords(['operator', 'quality'])).toBe('operator, quality');
  });

  it('lists only changed fields; for a creation, what it was created with', () => {
    expect(diffWords({ active: true, displayName: 'A' }, { active: false, displayName: 'A' })).toEqual([{ field: 'Active', before: 'yes', after: 'no' }]);
    expect(diffWords(null, { id: 4, code: 'FX-9' }, new Set(['id']))).toEqual([{ field: 'Code', before: null, after: 'FX-9' }]);
    expect(diffWords({ state: 'in_repair' }, { state: 'untested' })).toEqual([{ field: 'State', before: 'in repair', after: 'untested' }]);
    expect(diffWords({ checksum: '6b3b7048ab45c81694c1' }, { checksum: '15663afdca005d4520b2' })).toEqual([{ field: 'Checksum', before: '6b3b7048ab45…', after: '15663afdca00…' }]);
    expect(diffWords({ sentToRepairAt: '2026-12-02T16:31:00.000Z' }, { sentToRepairAt: null })).toEqual([{ field: 'Sent to repair', before: '2026-12-02 16:31 UTC', after: '(none)' }]);
  });
});
