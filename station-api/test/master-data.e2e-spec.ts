import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Fixture } from '../src/fixtures/fixture.entity';
import { Lot } from '../src/lots/lot.entity';
import { Product } from '../src/products/product.entity';
import { Station } from '../src/stations/station.entity';
import { Unit } from '../src/units/unit.entity';
import { User } from '../src/users/user.entity';
import { createTestApp, login, TestApp } from './create-test-app';

const DAY_MS = 86_400_000;

describe('plant master data', () => {
  let t: TestApp;
  const tokens: Record<string, string> = {};
  const http = () => request(t.app.getHttpServer());
  const as = <T extends request.Test>(role: string, r: T) => r.set('Authorization', `Bearer ${tokens[role]}`);

  beforeAll(async () => {
    t = await createTestApp();
    for (const role of ['operator', 'engineer', 'quality', 'admin']) tokens[role] = await login(t.app, role);
  });
  afterAll(async () => t?.close());

  async function counts() {
    const em = t.orm.em.fork();
    return {
      users: await em.count(User),
      products: await em.count(Product),
      fixtures: await em.count(Fixture),
      stations: await em.count(Station),
      lots: await em.count(Lot),
      units: await em.count(Unit),
    };
  }

  describe('demo seed', () => {
    it('holds the plant of docs/architecture.md', async () => {
      const products = (await as('operator', http().get('/api/products')).expect(200)).body;
      expect(products.map((p: { partNumber: string }) => p.partNumber)).toEqual(['OB-BK0503', 'OB-BK1202', 'OB-BK3305']);
      expect(products[0]).toMatchObject({ vinMinV: 9, vinNomV: 12, vinMaxV: 18, voutNomV: 5, ioutRatedA: 3, serialPattern: String.raw`^K5A-\d{4}-\d{5}$` });

      const fixtures = (await as('operator', http().get('/api/fixtures')).expect(200)).body;
      expect(fixtures.map((f: { code: string; portPath: string; baudRate: number }) => [f.code, f.portPath, f.baudRate])).toEqual([
        ['FX-101', 'mock:FX-101', 115200],
        ['FX-102', 'mock:FX-102', 115200],
        ['FX-103', 'mock:FX-103', 115200],
      ]);
      const dueInDays = fixtures.map((f: { calibrationDueAt: string }) => (Date.parse(f.calibrationDueAt) - Date.now()) / DAY_MS);
      expect(dueInDays[0]).toBeGreaterThan(60);
      expect(dueInDays[1]).toBeGreaterThan(60);
      expect(dueInDays[2]).toBeGreaterThan(18);
      expect(dueInDays[2]).toBeLessThan(22);
      for (const f of fixtures) {
        expect(f.calibrationOverdue).toBe(false);
        expect(Date.parse(f.calibratedAt)).toBeLessThan(Date.now() - 60 * DAY_MS);
        expect(f.contactCyclesUsed).toBeGreaterThan(1000);
        expect(f.contactCyclesUsed).toBeLessThan(10_000);
        expect(f.contactCyclesAllowed).toBe(50_000);
      }

      const stations = (await as('operator', http().get('/api/stations')).expect(200)).body;
      expect(stations.map((s: { code: string; fixture: { code: string } }) => [s.code, s.fixture.code])).toEqual([
        ['EOL-1', 'FX-101'],
        ['EOL-2', 'FX-102'],
        ['EOL-3', 'FX-103'],
      ]);
      for (const s of stations) {
        expect(s.activeLot.state).toBe('open');
        // state and reasons come from the run engine once it is plugged in; here only their shape
        expect(['idle', 'ready', 'testing', 'fault', 'blocked']).toContain(s.state);
        expect(Array.isArray(s.reasons)).toBe(true);
      }
      expect(stations.map((s: { activeLot: { partNumber: string } }) => s.activeLot.partNumber)).toEqual(['OB-BK0503', 'OB-BK3305', 'OB-BK1202']);

      const lots = (await as('operator', http().get('/api/lots')).expect(200)).body as { code: string; state: string; plannedQuantity: number; product: { partNumber: string }; unitCounts: { total: number; untested: number } }[];
      expect(lots.length).toBeGreaterThanOrEqual(6);
      const history = lots.filter((l) => l.plannedQuantity === 220);
      expect(history).toHaveLength(5);
      expect(new Set(history.map((l) => l.state))).toEqual(new Set(['open', 'released']));
      expect(new Set(lots.map((l) => l.product.partNumber)).size).toBe(3);
      for (const l of lots) {
        expect(l.code).toMatch(/^LB-\d{4}-\d{2}$/);
        expect(l.unitCounts.total).toBe(l.plannedQuantity);
      }
      const active = stations.map((s: { activeLot: { id: number } }) => lots.find((l) => (l as unknown as { id: number }).id === s.activeLot.id)!);
      for (const l of active) expect(l.unitCounts.untested).toBeGreaterThan(0);
    });

    it('is idempotent: running the seeder again creates nothing', async () => {
      const { DatabaseSeeder } = await import('../src/database/seeders/DatabaseSeeder');
      const before = await counts();
      expect(before).toMatchObject({ products: 3, fixtures: 3, stations: 3 });
      await t.orm.getSeeder().seed(DatabaseSeeder);
      expect(await counts()).toEqual(before);
    });
  });

  describe('products', () => {
    const body = {
      partNumber: 'OB-BK1803',
      name: 'Buck module 24 V to 1.8 V, 3 A',
      family: 'BK compact',
      vinMinV: 18,
      vinNomV: 24,
      vinMaxV: 36,
      voutNomV: 1.8,
      ioutRatedA: 3,
      serialPattern: String.raw`^K18-\d{4}-\d{5}$`,
    };

    it('may be created by an engineer, not by an operator; duplicates are refused', async () => {
      await as('operator', http().post('/api/products')).send(body).expect(403);
      const res = await as('engineer', http().post('/api/products')).send(body).expect(201);
      expect(res.body).toMatchObject({ ...body, id: expect.any(Number), active: true });
      const dup = await as('admin', http().post('/api/products')).send(body).expect(409);
      expect(dup.body.details.code).toBe('part_number_taken');
      const audit = await as('admin', http().get('/api/audit')).query({ entityType: 'product', action: 'product.created' }).expect(200);
      expect(audit.body.items[0]).toMatchObject({ actorName: 'engineer', after: { partNumber: 'OB-BK1803' } });
    });

    it('refuses an unusable serial pattern and inconsistent ratings, naming the field', async () => {
      const pat = await as('engineer', http().post('/api/products')).send({ ...body, partNumber: 'OB-X1', serialPattern: '^K18-.*$' }).expect(400);
      expect(pat.body.details).toContainEqual(expect.objectContaining({ field: 'serialPattern' }));
      const broken = await as('engineer', http().post('/api/products')).send({ ...body, partNumber: 'OB-X2', serialPattern: '^K18-(' }).expect(400);
      expect(broken.body.message).toMatch(/not a valid regular expression/);
      // a buck only steps down: Vout at or above Vin min is a typing error
      const up = await as('engineer', http().post('/api/products')).send({ ...body, partNumber: 'OB-X3', voutNomV: 20 }).expect(400);
      expect(up.body.details).toEqual([{ field: 'voutNomV', problems: [expect.stringMatching(/steps the voltage down/)] }]);
      const neg = await as('engineer', http().post('/api/products')).send({ ...body, partNumber: 'OB-X4', ioutRatedA: -1, colour: 'red' }).expect(400);
      expect(neg.body.details.map((d: { field: string }) => d.field)).toEqual(expect.arrayContaining(['ioutRatedA', 'colour']));
    });

    it('updates a product and refuses a serial-pattern change once units exist', async () => {
      const products = (await as('engineer', http().get('/api/products'))).body as { id: number; partNumber: string }[];
      const bk0503 = products.find((p) => p.partNumber === 'OB-BK0503')!;
      const res = await as('engineer', http().patch(`/api/products/${bk0503.id}`)).send({ name: 'Buck module 12 V to 5 V, 3 A (rev B)' }).expect(200);
      expect(res.body).toMatchObject({ name: 'Buck module 12 V to 5 V, 3 A (rev B)', vinNomV: 12, serialPattern: String.raw`^K5A-\d{4}-\d{5}$` });
      const pat = await as('engineer', http().patch(`/api/products/${bk0503.id}`)).send({ serialPattern: String.raw`^K5B-\d{4}-\d{5}$` }).expect(409);
      expect(pat.body.details.code).toBe('serial_pattern_in_use');
      const bad = await as('engineer', http().patch(`/api/products/${bk0503.id}`)).send({ vinMinV: 13 }).expect(400);
      expect(bad.body.details).toContainEqual(expect.objectContaining({ field: 'vinNomV' }));
      await as('engineer', http().get(`/api/products/${bk0503.id}`)).expect(200).expect((r) => expect(r.body.vinMinV).toBe(9));
    });
  });

  describe('fixtures', () => {
    let fx103: { id: number; contactCyclesUsed: number };
    beforeAll(async () => {
      fx103 = (await as('engineer', http().get('/api/fixtures'))).body.find((f: { code: string }) => f.code === 'FX-103');
    });

    it('records a calibration and audits it', async () => {
      const calibratedAt = new Date(Date.now() - DAY_MS).toISOString();
      const dueAt = new Date(Date.now() + 365 * DAY_MS).toISOString();
      await as('operator', http().post(`/api/fixtures/${fx103.id}/calibrations`)).send({}).expect(403);
      const res = await as('engineer', http().post(`/api/fixtures/${fx103.id}/calibrations`))
        .send({ calibratedAt, dueAt, certificate: 'OBE-CAL-26-1402', voltageUncertaintyV: 0.003, currentUncertaintyA: 0.002 })
        .expect(200);
      expect(res.body).toMatchObject({ calibratedAt, calibrationDueAt: dueAt, calibrationCertificate: 'OBE-CAL-26-1402', voltageUncertaintyV: 0.003, currentUncertaintyA: 0.002 });
      const audit = await as('quality', http().get('/api/audit')).query({ entityType: 'fixture', entityId: String(fx103.id), action: 'fixture.calibrated' }).expect(200);
      expect(audit.body.items[0]).toMatchObject({ actorName: 'engineer', before: { calibrationCertificate: 'OBE-CAL-25-1190' }, after: { calibrationCertificate: 'OBE-CAL-26-1402' } });
    });

    it('refuses impossible calibration dates and missing uncertainties', async () => {
      const now = Date.now();
      const future = await as('engineer', http().post(`/api/fixtures/${fx103.id}/calibrations`))
        .send({ calibratedAt: new Date(now + 3 * DAY_MS).toISOString(), dueAt: new Date(now + 400 * DAY_MS).toISOString(), certificate: 'C', voltageUncertaintyV: 0.003, currentUncertaintyA: 0.002 })
        .expect(400);
      expect(future.body.details).toContainEqual(expect.objectContaining({ field: 'calibratedAt' }));
      const backwards = await as('engineer', http().post(`/api/fixtures/${fx103.id}/calibrations`))
        .send({ calibratedAt: new Date(now - DAY_MS).toISOString(), dueAt: new Date(now - 2 * DAY_MS).toISOString(), certificate: 'C', voltageUncertaintyV: 0.003, currentUncertaintyA: 0.002 })
        .expect(400);
      expect(backwards.body.details).toContainEqual(expect.objectContaining({ field: 'dueAt' }));
      const missing = await as('engineer', http().post(`/api/fixtures/${fx103.id}/calibrations`)).send({ calibratedAt: 'yesterday', certificate: 'C' }).expect(400);
      expect(missing.body.details.map((d: { field: string }) => d.field)).toEqual(
        expect.arrayContaining(['calibratedAt', 'dueAt', 'voltageUncertaintyV', 'currentUncertaintyA']),
      );
    });

    it('resets the contact cycles after a contact change, with the reason audited', async () => {
      await as('engineer', http().post(`/api/fixtures/${fx103.id}/contacts-replaced`)).send({}).expect(400);
      const res = await as('engineer', http().post(`/api/fixtures/${fx103.id}/contacts-replaced`)).send({ reason: 'Spring contacts replaced, worn tips' }).expect(200);
      expect(res.body).toMatchObject({ contactCyclesUsed: 0, contactCyclesRemaining: 50_000 });
      const audit = await as('admin', http().get('/api/audit')).query({ action: 'fixture.contacts_replaced' }).expect(200);
      expect(audit.body.items[0]).toMatchObject({ reason: 'Spring contacts replaced, worn tips', before: { contactCyclesUsed: fx103.contactCyclesUsed }, after: { contactCyclesUsed: 0 } });
    });

    it('creates and updates a fixture, validating port and baud rate', async () => {
      const body = { code: 'FX-104', name: 'Spare fixture', portPath: '/dev/ttyUSB0', calibrationDueAt: new Date(Date.now() + 200 * DAY_MS).toISOString() };
      const bad = await as('engineer', http().post('/api/fixtures')).send({ ...body, portPath: 'C:/tty', baudRate: 12345 }).expect(400);
      expect(bad.body.details.map((d: { field: string }) => d.field)).toEqual(expect.arrayContaining(['portPath', 'baudRate']));
      const res = await as('engineer', http().post('/api/fixtures')).send(body).expect(201);
      expect(res.body).toMatchObject({ code: 'FX-104', baudRate: 115200, commandTimeoutMs: 2000, contactCyclesUsed: 0, active: true });
      await as('engineer', http().post('/api/fixtures')).send(body).expect(409);
      const upd = await as('admin', http().patch(`/api/fixtures/${res.body.id}`)).send({ baudRate: 57600, active: false }).expect(200);
      expect(upd.body).toMatchObject({ baudRate: 57600, active: false, portPath: '/dev/ttyUSB0' });
      await as('engineer', http().get('/api/fixtures/99999')).expect(404);
    });
  });

  describe('lots and units', () => {
    it('opens a lot and registers its units with serials of this week following the product pattern', async () => {
      const { yearWeekCode } = await import('../src/units/serial-numbers');
      const product = (await as('quality', http().get('/api/products'))).body.find((p: { partNumber: string }) => p.partNumber === 'OB-BK1202');
      await as('operator', http().post('/api/lots')).send({ code: 'LB-9999-01', productId: product.id, plannedQuantity: 5 }).expect(403);
      const res = await as('quality', http().post('/api/lots')).send({ code: 'LB-9999-01', productId: product.id, plannedQuantity: 25 }).expect(201);
      const yyww = yearWeekCode(new Date());
      expect(res.body).toMatchObject({ code: 'LB-9999-01', state: 'open', plannedQuantity: 25, product: { partNumber: 'OB-BK1202' } });
      expect(res.body.unitCounts).toEqual({ untested: 25, passed: 0, failed: 0, in_repair: 0, scrapped: 0, total: 25 });
      // the seeded active lot of this week took sequences 1..120, so the new lot continues at 121
      expect(res.body.firstSerial).toBe(`KC2-${yyww}-00121`);
      expect(res.body.lastSerial).toBe(`KC2-${yyww}-00145`);
      const pattern = new RegExp(product.serialPattern);
      const unit = await as('operator', http().get(`/api/units/${res.body.lastSerial}`)).expect(200);
      expect(unit.body.serial).toMatch(pattern);
      expect(unit.body).toMatchObject({ state: 'untested', testCount: 0, lot: { code: 'LB-9999-01', state: 'open' }, product: { partNumber: 'OB-BK1202' } });

      const audit = await as('admin', http().get('/api/audit')).query({ action: 'lot.created', entityId: String(res.body.id) }).expect(200);
      expect(audit.body.items[0].after).toMatchObject({ plannedQuantity: 25, firstSerial: res.body.firstSerial });
    });

    it('takes an explicit first sequence and refuses one that would reuse serials', async () => {
      const product = (await as('engineer', http().get('/api/products'))).body.find((p: { partNumber: string }) => p.partNumber === 'OB-BK0503');
      const ok = await as('engineer', http().post('/api/lots')).send({ code: 'LB-9999-02', productId: product.id, plannedQuantity: 3, firstSequence: 5000 }).expect(201);
      expect(ok.body.firstSerial).toMatch(/^K5A-\d{4}-05000$/);
      const clash = await as('engineer', http().post('/api/lots')).send({ code: 'LB-9999-03', productId: product.id, plannedQuantity: 10, firstSequence: 4995 }).expect(409);
      expect(clash.body).toMatchObject({ details: { code: 'serial_taken' }, message: expect.stringMatching(/-05000 is already registered/) });
      const past = await as('engineer', http().post('/api/lots')).send({ code: 'LB-9999-04', productId: product.id, plannedQuantity: 10, firstSequence: 99_995 }).expect(409);
      expect(past.body.details.code).toBe('sequence_exhausted');
      // nothing of the refused lots was stored
      const lots = (await as('engineer', http().get('/api/lots')).query({ productId: product.id })).body.map((l: { code: string }) => l.code);
      expect(lots).not.toContain('LB-9999-03');
      expect(lots).not.toContain('LB-9999-04');
    });

    it('validates lot input', async () => {
      const dup = await as('engineer', http().post('/api/lots')).send({ code: 'LB-9999-01', productId: 1, plannedQuantity: 1 }).expect(409);
      expect(dup.body.details.code).toBe('lot_code_taken');
      const bad = await as('engineer', http().post('/api/lots')).send({ code: 'lb 1', productId: 0, plannedQuantity: 0, firstSequence: 100_000 }).expect(400);
      expect(bad.body.details.map((d: { field: string }) => d.field)).toEqual(expect.arrayContaining(['code', 'productId', 'plannedQuantity', 'firstSequence']));
      await as('engineer', http().post('/api/lots')).send({ code: 'LB-9999-05', productId: 9999, plannedQuantity: 1 }).expect(404);
    });

    it('filters lots by product and state and shows counts by state for one lot', async () => {
      const released = (await as('operator', http().get('/api/lots')).query({ state: 'released' }).expect(200)).body;
      expect(released.length).toBeGreaterThan(0);
      for (const l of released) expect(l.state).toBe('released');
      await as('operator', http().get('/api/lots')).query({ state: 'lost' }).expect(400);
      const one = (await as('operator', http().get(`/api/lots/${released[0].id}`)).expect(200)).body;
      expect(one.unitCounts.total).toBe(220);
      expect(one.firstSerial).toMatch(/-00001$/);
      await as('operator', http().get('/api/lots/99999')).expect(404);
    });

    it('answers 404 with a code for an unknown serial', async () => {
      const res = await as('operator', http().get('/api/units/K5A-0000-00000')).expect(404);
      expect(res.body).toMatchObject({ details: { code: 'unknown_serial' }, message: expect.stringMatching(/K5A-0000-00000/) });
    });
  });

  describe('stations', () => {
    it('sets an open lot active, refuses a released one, and audits the change', async () => {
      const stations = (await as('quality', http().get('/api/stations'))).body;
      const eol1 = stations[0];
      const lots = (await as('quality', http().get('/api/lots'))).body as { id: number; code: string; state: string; product: { partNumber: string } }[];
      const released = lots.find((l) => l.state === 'released')!;
      const refused = await as('quality', http().patch(`/api/stations/${eol1.id}`)).send({ activeLotId: released.id }).expect(409);
      expect(refused.body).toMatchObject({ details: { code: 'lot_not_open' }, message: expect.stringMatching(/released/) });

      const open = lots.find((l) => l.code === 'LB-9999-02')!;
      const res = await as('quality', http().patch(`/api/stations/${eol1.id}`)).send({ activeLotId: open.id }).expect(200);
      expect(res.body.activeLot).toMatchObject({ id: open.id, code: 'LB-9999-02', state: 'open' });
      const audit = await as('admin', http().get('/api/audit')).query({ entityType: 'station', entityId: String(eol1.id) }).expect(200);
      expect(audit.body.items[0]).toMatchObject({ action: 'station.updated', actorName: 'quality', before: { activeLotId: eol1.activeLot.id }, after: { activeLotCode: 'LB-9999-02' } });

      const cleared = await as('engineer', http().patch(`/api/stations/${eol1.id}`)).send({ activeLotId: null }).expect(200);
      expect(cleared.body.activeLot).toBeNull();
      expect(cleared.body.state).not.toBe('ready');
      expect(cleared.body.reasons.some((r: string) => /active lot/i.test(r))).toBe(true);
      await as('operator', http().patch(`/api/stations/${eol1.id}`)).send({ activeLotId: open.id }).expect(403);
    });

    it('refuses a fixture already on another station', async () => {
      const stations = (await as('engineer', http().get('/api/stations'))).body;
      const res = await as('engineer', http().patch(`/api/stations/${stations[0].id}`)).send({ fixtureId: stations[1].fixture.id }).expect(409);
      expect(res.body).toMatchObject({ details: { code: 'fixture_in_use', stationCode: 'EOL-2' } });
      await as('engineer', http().patch(`/api/stations/${stations[0].id}`)).send({ fixtureId: 'two' }).expect(400);
      await as('engineer', http().get('/api/stations/99999')).expect(404);
      const one = await as('operator', http().get(`/api/stations/${stations[1].id}`)).expect(200);
      expect(one.body.code).toBe('EOL-2');
    });
  });
});
