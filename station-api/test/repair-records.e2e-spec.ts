import { sum } from 'simple-statistics';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditEvent } from '../src/audit/audit-event.entity';
import { Lot } from '../src/lots/lot.entity';
import { RepairCause } from '../src/repair/repair-cause.entity';
import { RepairDisposition, RepairRecord } from '../src/repair/repair-record.entity';
import { repairQueueReason } from '../src/repair/retest-policy';
import { RunVerdict, TestRun } from '../src/runs/test-run.entity';
import { Unit, UnitState } from '../src/units/unit.entity';
import { User } from '../src/users/user.entity';
import { createTestApp, login, TestApp } from './create-test-app';
import { EngineHarness } from './engine-helpers';

/**
 * Repair records and causes (issue 12): the cause list engineers maintain, a record required to return a unit
 * for retest or scrap it, corrections as new records, the Pareto by cause, and the repair queue's filters,
 * sorting, paging and serial search (plain SQL).
 */
describe('repair records, causes, Pareto by cause and the repair queue', () => {
  let t: TestApp;
  let h: EngineHarness;
  const tokens: Record<string, string> = {};
  const auth = (role: string) => ({ Authorization: `Bearer ${tokens[role]}` });
  let eol1: number;
  let eol2: number;
  let lotA: Lot;
  let lotB: Lot;
  let failedA: string;
  let failedB: string;
  let failedStepKey: string;
  let solder: RepairCause;
  const get = (url: string, role = 'engineer') => h.http().get(url).set(auth(role));
  const post = (url: string, body: object, role = 'engineer') => h.http().post(url).set(auth(role)).send(body);
  const repair = (serial: string, body: object, role = 'engineer') => post(`/api/units/${encodeURIComponent(serial)}/repair`, body, role);

  beforeAll(async () => {
    t = await createTestApp();
    for (const role of ['operator', 'engineer', 'quality', 'admin']) tokens[role] = await login(t.app, role);
    h = new EngineHarness(t, tokens.operator);
    const s1 = await h.station('EOL-1');
    const s2 = await h.station('EOL-2');
    eol1 = s1.id;
    eol2 = s2.id;
    [failedA] = await h.freshSerials('EOL-1', 1);
    [failedB] = await h.freshSerials('EOL-2', 1);
    await h.simulate('FX-101', { defectRates: {}, serials: { [failedA]: 'wrong_feedback' } });
    await h.simulate('FX-102', { defectRates: {}, serials: { [failedB]: 'wrong_feedback' } });
    const runA = await h.run(eol1, failedA);
    expect(runA.verdict).toBe('fail');
    expect((await h.run(eol2, failedB)).verdict).toBe('fail');
    failedStepKey = (await h.detail(runA.runId)).failedStepKey;
    // both go to the queue now (sent by the operator), with attempts left
    await post(`/api/units/${failedA}/send-to-repair`, { note: 'Vout high' }, 'operator').expect(200);
    await post(`/api/units/${failedB}/send-to-repair`, {}, 'operator').expect(200);

    const em = t.orm.em.fork();
    lotA = (await em.findOneOrFail(Unit, { serial: failedA }, { populate: ['lot'] })).lot;
    lotB = (await em.findOneOrFail(Unit, { serial: failedB }, { populate: ['lot'] })).lot;
    solder = await em.findOneOrFail(RepairCause, { name: 'Solder bridge' });
  });
  afterAll(async () => t?.close());

  describe('the list of repair causes', () => {
    it('is seeded with active causes, alphabetical, readable by every role', async () => {
      const list = (await get('/api/repair-causes', 'operator').expect(200)).body as { name: string; active: boolean; recordCount: number }[];
      expect(list.length).toBeGreaterThanOrEqual(8);
      expect(list.map((c) => c.name)).toEqual([...list.map((c) => c.name)].sort((a, b) => a.localeCompare(b)));
      expect(list.map((c) => c.name)).toEqual(expect.arrayContaining(['Solder bridge', 'Cold joint', 'Wrong component value', 'Cracked inductor']));
      expect(list.every((c) => c.active && c.recordCount === 0)).toBe(true);
    });

    it('lets engineers and admin maintain it; operator and quality are refused with 403', async () => {
      await post('/api/repair-causes', { name: 'Tombstoned resistor' }, 'operator').expect(403);
      await post('/api/repair-causes', { name: 'Tombstoned resistor' }, 'quality').expect(403);
      await h.http().post('/api/repair-causes').send({ name: 'Tombstoned resistor' }).expect(401);
      await h.http().patch(`/api/repair-causes/${solder.id}`).set(auth('quality')).send({ active: false }).expect(403);
      await h.http().delete(`/api/repair-causes/${solder.id}`).set(auth('operator')).expect(403);
    });

    it('adds a cause (spaces tidied), refuses a duplicate in any case and a bad name with messages naming the field', async () => {
      const made = (await post('/api/repair-causes', { name: '  Tombstoned   resistor ' }).expect(201)).body;
      expect(made).toMatchObject({ name: 'Tombstoned resistor', active: true, recordCount: 0 });
      const dup = await post('/api/repair-causes', { name: 'TOMBSTONED RESISTOR' }, 'admin').expect(409);
      expect(dup.body.details).toMatchObject({ code: 'duplicate_cause', causeId: made.id });
      expect(dup.body.message).toBe('A repair cause called "Tombstoned resistor" already exists.');
      const short = await post('/api/repair-causes', { name: 'x' }).expect(400);
      expect(short.body.details).toEqual([{ field: 'name', problems: ['name must be 3 to 80 characters'] }]);
      await post('/api/repair-causes', {}).expect(400);
      const extra = await post('/api/repair-causes', { name: 'Fine name', active: false }).expect(400);
      expect(extra.body.message).toContain('Unknown field "active"');
    });

    it('renames and switches a cause off and on, each audited; a switched-off cause is listed only with all=true', async () => {
      const made = (await post('/api/repair-causes', { name: 'Wrong polarity' }).expect(201)).body;
      const renamed = (await h.http().patch(`/api/repair-causes/${made.id}`).set(auth('engineer')).send({ name: 'Reversed polarity' }).expect(200)).body;
      expect(renamed).toMatchObject({ id: made.id, name: 'Reversed polarity', active: true });
      await h.http().patch(`/api/repair-causes/${made.id}`).set(auth('engineer')).send({ name: 'solder BRIDGE' }).expect(409);
      await h.http().patch(`/api/repair-causes/${made.id}`).set(auth('admin')).send({ active: false }).expect(200);
      const active = (await get('/api/repair-causes').expect(200)).body as { id: number }[];
      expect(active.map((c) => c.id)).not.toContain(made.id);
      const all = (await get('/api/repair-causes?all=true').expect(200)).body as { id: number; active: boolean }[];
      expect(all.find((c) => c.id === made.id)).toMatchObject({ active: false });
      await h.http().patch(`/api/repair-causes/${made.id}`).set(auth('engineer')).send({ active: true }).expect(200);
      await h.http().patch('/api/repair-causes/99999').set(auth('engineer')).send({ active: true }).expect(404);
      const badId = await h.http().patch('/api/repair-causes/abc').set(auth('engineer')).send({ active: true }).expect(400);
      expect(badId.body.message).toBe('The cause id in the address must be a whole number, e.g. 1.');
      const events = await t.orm.em.fork().find(AuditEvent, { entityType: 'repair_cause', entityId: String(made.id) }, { orderBy: { id: 'asc' }, populate: ['actor'] });
      expect(events.map((e) => [e.action, e.before?.name ?? null, e.after?.name, e.after?.active, e.actor?.username])).toEqual([
        ['repair_cause.created', null, 'Wrong polarity', true, 'engineer'],
        ['repair_cause.renamed', 'Wrong polarity', 'Reversed polarity', true, 'engineer'],
        ['repair_cause.switched_off', 'Reversed polarity', 'Reversed polarity', false, 'admin'],
        ['repair_cause.switched_on', 'Reversed polarity', 'Reversed polarity', true, 'engineer'],
      ]);
    });

    it('deletes a cause never used (audited), and refuses to delete one in use: switch it off instead', async () => {
      const unused = (await post('/api/repair-causes', { name: 'Short-lived cause' }).expect(201)).body;
      await h.http().delete(`/api/repair-causes/${unused.id}`).set(auth('engineer')).expect(204);
      expect(await t.orm.em.fork().count(AuditEvent, { action: 'repair_cause.deleted', entityId: String(unused.id) })).toBe(1);
      await h.http().delete(`/api/repair-causes/${unused.id}`).set(auth('engineer')).expect(404);
      // one record naming the cause makes it "in use"
      const used = (await post('/api/repair-causes', { name: 'Used cause' }).expect(201)).body;
      const em = t.orm.em.fork();
      const unit = await em.findOneOrFail(Unit, { serial: failedB });
      em.persist(em.create(RepairRecord, { unit, cause: used.id, symptom: 's', actionTaken: 'a', disposition: RepairDisposition.Retest, technician: await em.findOneOrFail(User, { username: 'engineer' }), recordedAt: new Date(2025, 5, 1, 12) }));
      await em.flush();
      const refused = await h.http().delete(`/api/repair-causes/${used.id}`).set(auth('admin')).expect(409);
      expect(refused.body.details).toEqual({ code: 'cause_in_use', recordCount: 1 });
      expect(refused.body.message).toContain('Switch it off instead');
      expect(await t.orm.em.fork().count(RepairCause, { id: used.id })).toBe(1);
    });
  });

  describe('a repair record is required to return a unit for retest or scrap it', () => {
    it('receives without a record, and refuses record fields on receive rather than dropping them', async () => {
      const extra = await repair(failedA, { action: 'receive', note: 'on bench 2', symptom: 'Vout high' }).expect(400);
      expect(extra.body.details).toEqual([{ field: 'symptom', problems: ['symptom belongs to return or scrap, not to receive'] }]);
      const ok = await repair(failedA, { action: 'receive', note: 'on bench 2' }).expect(200);
      expect(ok.body).toMatchObject({ toState: 'in_repair', record: null });
    });

    it('refuses return and scrap without symptom, cause and action, naming each field', async () => {
      const res = await repair(failedA, { action: 'return' }).expect(400);
      expect(res.body.details.map((d: { field: string }) => d.field).sort()).toEqual(['actionTaken', 'causeId', 'symptom']);
      expect(res.body.message).toContain('symptom must be 3 to 500 characters: say what was wrong with the unit');
      expect(res.body.message).toContain('causeId must be the id of a repair cause (choose one from the list)');
      const blank = await repair(failedA, { action: 'scrap', symptom: '  ', causeId: solder.id, actionTaken: 'none' }).expect(400);
      expect(blank.body.details).toEqual([{ field: 'symptom', problems: ['symptom must be 3 to 500 characters: say what was wrong with the unit'] }]);
      const word = await repair(failedA, { action: 'return', symptom: 'Vout high', causeId: 'solder', actionTaken: 'reflowed' }).expect(400);
      expect(word.body.details[0].field).toBe('causeId');
      const unknown = await repair(failedA, { action: 'return', symptom: 'Vout high', causeId: 99999, actionTaken: 'reflowed' }).expect(400);
      expect(unknown.body.details).toEqual([{ field: 'causeId', problems: ['there is no repair cause with id 99999'] }]);
      expect((await t.orm.em.fork().findOneOrFail(Unit, { serial: failedA })).state).toBe(UnitState.InRepair);
    });

    it('refuses a switched-off cause with a message saying what to do', async () => {
      const off = (await post('/api/repair-causes', { name: 'Retired cause' }).expect(201)).body;
      await h.http().patch(`/api/repair-causes/${off.id}`).set(auth('engineer')).send({ active: false }).expect(200);
      const res = await repair(failedA, { action: 'return', symptom: 'Vout high', causeId: off.id, actionTaken: 'reflowed' }).expect(400);
      expect(res.body.message).toBe('causeId: the cause "Retired cause" is switched off; choose an active cause, or ask an engineer to switch it on again.');
    });

    it('returns the unit with a record (who, when, disposition retest) and writes it into the audit event', async () => {
      const res = await repair(failedA, { action: 'return', symptom: ' Output 5.6 V at full load ', causeId: solder.id, actionTaken: 'Removed bridge on U1 pins 3-4' }).expect(200);
      expect(res.body).toMatchObject({ fromState: 'in_repair', toState: 'untested' });
      expect(res.body.record).toMatchObject({
        serial: failedA,
        symptom: 'Output 5.6 V at full load',
        cause: { id: solder.id, name: 'Solder bridge' },
        actionTaken: 'Removed bridge on U1 pins 3-4',
        disposition: 'retest',
        technician: { displayName: 'Test engineer' },
        correctsId: null,
        correctedById: null,
      });
      expect(Date.parse(res.body.record.recordedAt)).toBeGreaterThan(Date.now() - 60_000);
      const lastFail = await t.orm.em.fork().findOneOrFail(TestRun, { unit: { serial: failedA }, verdict: RunVerdict.Fail });
      expect(res.body.record.failedRunId).toBe(lastFail.id);
      const event = await t.orm.em.fork().findOneOrFail(AuditEvent, { id: res.body.auditEventId });
      expect(event.action).toBe('unit.repair_returned');
      expect(event.reason).toBe('Removed bridge on U1 pins 3-4');
      expect(event.after).toMatchObject({
        state: 'untested',
        repairRecord: { id: res.body.record.id, symptom: 'Output 5.6 V at full load', causeId: solder.id, cause: 'Solder bridge', action: 'Removed bridge on U1 pins 3-4', disposition: 'retest' },
      });
    });

    it('scraps a unit with a record (disposition scrapped) and lists records by serial in any case', async () => {
      const res = await repair(failedB, { action: 'scrap', note: 'not worth rework', symptom: 'No output', causeId: solder.id, actionTaken: 'None: scrapped' }, 'quality').expect(200);
      expect(res.body.record).toMatchObject({ disposition: 'scrapped', technician: { displayName: 'Quality engineer' } });
      expect((await t.orm.em.fork().findOneOrFail(AuditEvent, { id: res.body.auditEventId })).reason).toBe('not worth rework');
      const list = (await get(`/api/repair-records?serial=${failedB.toLowerCase()}`, 'operator').expect(200)).body;
      expect(list.items.map((r: { serial: string; disposition: string }) => [r.serial, r.disposition])).toEqual([
        [failedB, 'scrapped'],
        [failedB, 'retest'],
      ]);
      expect(list.total).toBe(2);
    });

    it('never edits a record: a correction is a new record pointing at it, audited with the reason', async () => {
      const original = (await get(`/api/repair-records?serial=${failedA}`).expect(200)).body.items[0];
      const cracked = (await get('/api/repair-causes').expect(200)).body.find((c: { name: string }) => c.name === 'Cracked inductor');
      await post(`/api/repair-records/${original.id}/corrections`, { symptom: 'x', causeId: cracked.id, actionTaken: 'y', reason: 'z' }).expect(400);
      await post(`/api/repair-records/${original.id}/corrections`, { symptom: 'Output high', causeId: cracked.id, actionTaken: 'Replaced L1', reason: 'Bridge was a symptom; L1 cracked' }, 'operator').expect(403);
      const fixed = (
        await post(`/api/repair-records/${original.id}/corrections`, { symptom: 'Output high', causeId: cracked.id, actionTaken: 'Replaced L1', reason: 'Bridge was a symptom; L1 cracked' }, 'quality').expect(201)
      ).body;
      expect(fixed).toMatchObject({ correctsId: original.id, cause: { name: 'Cracked inductor' }, disposition: 'retest', correctionReason: 'Bridge was a symptom; L1 cracked' });
      const records = (await get(`/api/repair-records?serial=${failedA}`).expect(200)).body.items;
      expect(records.find((r: { id: number }) => r.id === original.id)).toMatchObject({ cause: { name: 'Solder bridge' }, correctedById: fixed.id });
      const again = await post(`/api/repair-records/${original.id}/corrections`, { symptom: 'Output high', causeId: cracked.id, actionTaken: 'Replaced L1', reason: 'second try' }).expect(409);
      expect(again.body.details).toEqual({ code: 'record_already_corrected', correctedById: fixed.id });
      await post('/api/repair-records/99999/corrections', { symptom: 'Output high', causeId: cracked.id, actionTaken: 'Replaced L1', reason: 'no such record' }).expect(404);
      const ev = await t.orm.em.fork().findOneOrFail(AuditEvent, { action: 'unit.repair_record_corrected' });
      expect(ev).toMatchObject({ entityType: 'unit', reason: 'Bridge was a symptom; L1 cracked' });
      expect(ev.before).toMatchObject({ repairRecord: { id: original.id, cause: 'Solder bridge' } });
      expect(ev.after).toMatchObject({ repairRecord: { id: fixed.id, cause: 'Cracked inductor', correctsId: original.id } });
    });
  });

  describe('Pareto by cause', () => {
    // self-constructed example: records written in January 2026 on units of two lots, one record corrected
    beforeAll(async () => {
      const em = t.orm.em.fork();
      const tech = await em.findOneOrFail(User, { username: 'engineer' });
      const cause = async (name: string) => em.findOneOrFail(RepairCause, { name });
      const [sb, cj, ci] = [await cause('Solder bridge'), await cause('Cold joint'), await cause('Cracked inductor')];
      let n = 0;
      const unitIn = (lot: Lot) => {
        n += 1;
        const u = em.create(Unit, { serial: `PARETO-${lot.code}-${n}`, lot, product: lot.product, state: UnitState.Passed, testCount: 1, testCountAtReturn: 0 });
        em.persist(u);
        return u;
      };
      const rec = (lot: Lot, c: RepairCause, day: Date, corrects?: RepairRecord) => {
        const r = em.create(RepairRecord, { unit: unitIn(lot), cause: c, symptom: 's', actionTaken: 'a', disposition: RepairDisposition.Retest, technician: tech, recordedAt: day, corrects });
        em.persist(r);
        return r;
      };
      const jan10 = new Date(2026, 0, 10, 12);
      const jan11 = new Date(2026, 0, 11, 12);
      for (let i = 0; i < 3; i++) rec(lotA, sb, jan10);
      for (let i = 0; i < 2; i++) rec(lotA, ci, jan10);
      rec(lotA, cj, jan10);
      const wrong = rec(lotA, cj, jan10);
      await em.flush();
      // the corrected record counts only through its correction (Solder bridge)
      rec(lotA, sb, jan11, wrong);
      for (let i = 0; i < 2; i++) rec(lotB, cj, jan11);
      // outside the date range
      rec(lotA, ci, new Date(2026, 1, 5, 12));
      await em.flush();
    });

    const pareto = async (query: string) => (await get(`/api/repair-records/pareto?${query}`, 'quality').expect(200)).body as { records: number; bars: { label: string; count: number; percent: number; cumulativeCount: number; cumulativePercent: number; causeId: number }[] };

    it('counts current records by cause for a lot and a date range, largest first, with the cumulative percentage', async () => {
      const p = await pareto(`lotId=${lotA.id}&from=2026-01-01&to=2026-01-31`);
      // hand-computed: Solder bridge 3 + 1 correction = 4, Cracked inductor 2, Cold joint 1 (its second record was corrected away); 7 in all
      expect(p.records).toBe(7);
      expect(p.bars.map((b) => [b.label, b.count])).toEqual([
        ['Solder bridge', 4],
        ['Cracked inductor', 2],
        ['Cold joint', 1],
      ]);
      // simple-statistics sum as reference for the running totals
      const counts = [4, 2, 1];
      expect(p.bars.map((b) => b.cumulativeCount)).toEqual(counts.map((_, i) => sum(counts.slice(0, i + 1))));
      expect(p.bars[0].percent).toBeCloseTo((100 * 4) / 7, 10); // 57.142857…
      expect(p.bars[1].cumulativePercent).toBeCloseTo((100 * 6) / 7, 10); // 85.714285…
      expect(p.bars[2].cumulativePercent).toBe(100);
    });

    it('filters by product and by date range only', async () => {
      const all = await pareto('from=2026-01-01&to=2026-01-31');
      // 4 + 1 + 2 (lot B) Cold joint = 3, Cracked inductor 2: 9 in all
      expect(all.bars.map((b) => [b.label, b.count])).toEqual([
        ['Solder bridge', 4],
        ['Cold joint', 3],
        ['Cracked inductor', 2],
      ]);
      expect(all.bars[1].cumulativePercent).toBeCloseTo((100 * 7) / 9, 10);
      const b = await pareto(`productId=${lotB.product.id}&from=2026-01-01&to=2026-01-31`);
      expect(b.bars.map((x) => [x.label, x.count, x.cumulativePercent])).toEqual([['Cold joint', 2, 100]]);
      const feb = await pareto(`lotId=${lotA.id}&from=2026-02-01&to=2026-02-28`);
      expect(feb.bars.map((x) => [x.label, x.count])).toEqual([['Cracked inductor', 1]]);
      expect((await pareto('from=2020-01-01&to=2020-01-31')).bars).toEqual([]);
    });

    it('refuses bad filters with messages naming the field', async () => {
      const order = await get('/api/repair-records/pareto?from=2026-02-01&to=2026-01-01').expect(400);
      expect(order.body.message).toBe('from (2026-02-01) must not be after to (2026-01-01)');
      const lot = await get('/api/repair-records/pareto?lotId=abc').expect(400);
      expect(lot.body.message).toContain('lotId must be a whole number');
      const station = await get('/api/repair-records/pareto?stationId=1').expect(400);
      expect(station.body.message).toContain('stationId');
    });
  });

  describe('the repair queue: filter, sort, paging and serial search in SQL', () => {
    const queue = async (query = '', role = 'operator') => (await get(`/api/repair-queue?${query}`, role).expect(200)).body;

    beforeAll(async () => {
      // 30 units in repair (no failing run stored) and one failed unit with no attempts left, set up directly
      const em = t.orm.em.fork();
      const lot = await em.findOneOrFail(Lot, { id: lotA.id }, { populate: ['product'] });
      for (let i = 1; i <= 30; i++) {
        em.persist(em.create(Unit, { serial: `K5A-0101-9${String(i).padStart(4, '0')}`, lot, product: lot.product, state: UnitState.InRepair, testCount: 1, testCountAtReturn: 0 }));
      }
      em.persist(em.create(Unit, { serial: 'K5A-0101-80001', lot, product: lot.product, state: UnitState.Failed, testCount: 3, testCountAtReturn: 0 }));
      await em.flush();
      // put failedA back on the queue with its failing run: fail it again and send it
      await h.simulate('FX-101', { defectRates: {}, serials: { [failedA]: 'wrong_feedback' } });
      expect((await h.run(eol1, failedA)).verdict).toBe('fail');
      await post(`/api/units/${failedA}/send-to-repair`, {}, 'operator').expect(200);
    });

    it('answers 25 rows a page by default, with the total and no overlap between pages', async () => {
      const first = await queue();
      expect(first.total).toBe(32);
      expect(first.items).toHaveLength(25);
      const second = await queue('offset=25');
      expect(second.items).toHaveLength(7);
      const serials = [...first.items, ...second.items].map((i: { serial: string }) => i.serial);
      expect(new Set(serials).size).toBe(32);
      // oldest failure first; units with no stored failing run go last
      expect(first.items[0].serial).toBe(failedA);
    });

    it('answers only the columns it shows, and the reason agrees with the retest policy', async () => {
      const { items } = await queue('search=' + failedA);
      expect(items).toHaveLength(1);
      const item = items[0];
      expect(Object.keys(item).sort()).toEqual(['lastFailingRun', 'lot', 'reason', 'sentToRepairAt', 'serial', 'state', 'testCount', 'unitId'].sort());
      expect(Object.keys(item.lot).sort()).toEqual(['code', 'id', 'partNumber']);
      expect(Object.keys(item.lastFailingRun).sort()).toEqual(['attempt', 'failedStepKey', 'finishedAt', 'firstFailure', 'id', 'station'].sort());
      expect(item.lastFailingRun).toMatchObject({ station: { id: eol1, code: 'EOL-1' }, failedStepKey });
      expect(item.lastFailingRun.firstFailure).toMatchObject({ stepKey: failedStepKey, verdict: expect.stringMatching(/fail/) });
      expect(item.lastFailingRun.firstFailure.stepName).toMatch(/\w/);
      expect(item.lastFailingRun.firstFailure).not.toHaveProperty('raw');
      // the SQL CASE and ./retest-policy.ts repairQueueReason say the same for every queued unit
      const em = t.orm.em.fork();
      for (const it of (await queue('limit=1000')).items as { serial: string; reason: string; lastFailingRun: { id: number } | null }[]) {
        const unit = await em.findOneOrFail(Unit, { serial: it.serial });
        const run = it.lastFailingRun ? await em.findOneOrFail(TestRun, { id: it.lastFailingRun.id }, { populate: ['planVersion'] }) : null;
        expect(repairQueueReason(unit, run?.planVersion.maxAttempts ?? 3)).toBe(it.reason);
      }
    });

    it('finds a unit by any part of its serial in any case (a scanned repair tag gives the whole serial)', async () => {
      expect((await queue('search=k5a-0101-9001')).items.map((i: { serial: string }) => i.serial)).toEqual(
        Array.from({ length: 10 }, (_, i) => `K5A-0101-9001${i}`),
      );
      expect((await queue(`search=${failedA.toLowerCase()}`)).items.map((i: { serial: string }) => i.serial)).toEqual([failedA]);
      // % and _ are no wildcards
      expect((await queue('search=%25')).total).toBe(0);
      expect((await queue('search=K5A_0101')).total).toBe(0);
    });

    it('filters by state, lot, station and failed step, and lists the steps to choose from', async () => {
      expect((await queue('state=in_repair')).total).toBe(30);
      const failed = await queue('state=failed');
      expect(failed.items.map((i: { serial: string }) => i.serial).sort()).toEqual(['K5A-0101-80001', failedA].sort());
      expect((await queue(`lotId=${lotB.id}`)).total).toBe(0);
      expect((await queue(`stationId=${eol1}`)).items.map((i: { serial: string }) => i.serial)).toEqual([failedA]);
      const byStep = await queue(`step=${failedStepKey}`);
      expect(byStep.items.map((i: { serial: string }) => i.serial)).toEqual([failedA]);
      expect(byStep.steps).toEqual([{ key: failedStepKey, name: expect.stringMatching(/\w/) }]);
      expect(byStep.steps[0].name).not.toBe(failedStepKey);
      expect((await queue('step=no_such_step')).total).toBe(0);
    });

    it('sorts by a whitelisted column either way, and refuses any other with the list', async () => {
      const desc = await queue('sort=serial&dir=desc&limit=3&search=k5a-0101');
      expect(desc.items.map((i: { serial: string }) => i.serial)).toEqual(['K5A-0101-90030', 'K5A-0101-90029', 'K5A-0101-90028']);
      const asc = await queue('sort=serial&dir=asc&limit=1&search=k5a-0101');
      expect(asc.items[0].serial).toBe('K5A-0101-80001');
      const byState = await queue('sort=state&dir=asc&limit=2');
      expect(byState.items.map((i: { state: string }) => i.state)).toEqual(['failed', 'failed']);
      const bad = await get('/api/repair-queue?sort=serial;drop table units').expect(400);
      expect(bad.body.message).toContain('sort must be one of failedAt, serial, state, lot, station, step, tests');
      await get('/api/repair-queue?dir=up').expect(400);
      await get('/api/repair-queue?limit=0').expect(400);
      await get('/api/repair-queue?state=scrapped').expect(400);
    });
  });
});
