import type { EntityManager } from '@mikro-orm/core';
import { Seeder } from '@mikro-orm/seeder';
import { Fixture } from '../../fixtures/fixture.entity';
import { Lot, LotState } from '../../lots/lot.entity';
import { registerLot } from '../../lots/lot-registration';
import { Product } from '../../products/product.entity';
import { Station } from '../../stations/station.entity';
import { yearWeekCode } from '../../units/serial-numbers';
import { hashPassword } from '../../users/users.service';
import { Role, User } from '../../users/user.entity';

// Everything below is the invented Orrin Bay Electronics plant of docs/architecture.md.

export const DEMO_USERS: { username: string; password: string; displayName: string; roles: Role[] }[] = [
  { username: 'operator', password: 'operator-demo', displayName: 'Line B operator', roles: ['operator'] },
  { username: 'engineer', password: 'engineer-demo', displayName: 'Test engineer', roles: ['engineer'] },
  // a second engineer: plan versions need one engineer to write a change and another to release it
  { username: 'engineer2', password: 'engineer2-demo', displayName: 'Second test engineer', roles: ['engineer'] },
  { username: 'quality', password: 'quality-demo', displayName: 'Quality engineer', roles: ['quality'] },
  { username: 'admin', password: 'admin-demo', displayName: 'Administrator', roles: ['admin'] },
];

export const DEMO_PRODUCTS = [
  { partNumber: 'OB-BK0503', name: 'Buck module 12 V to 5 V, 3 A', family: 'BK compact', vinMinV: 9, vinNomV: 12, vinMaxV: 18, voutNomV: 5.0, ioutRatedA: 3.0, serialPattern: String.raw`^K5A-\d{4}-\d{5}$` },
  { partNumber: 'OB-BK3305', name: 'Buck module 24 V to 3.3 V, 5 A', family: 'BK compact', vinMinV: 18, vinNomV: 24, vinMaxV: 36, voutNomV: 3.3, ioutRatedA: 5.0, serialPattern: String.raw`^K3E-\d{4}-\d{5}$` },
  { partNumber: 'OB-BK1202', name: 'Buck module 24 V to 12 V, 2 A', family: 'BK rail', vinMinV: 16, vinNomV: 24, vinMaxV: 32, voutNomV: 12.0, ioutRatedA: 2.0, serialPattern: String.raw`^KC2-\d{4}-\d{5}$` },
] as const;

const DAY_MS = 86_400_000;

/** Fixture set-up relative to the day of the first seeding; days are negative in the past. */
export const DEMO_FIXTURES = [
  { code: 'FX-101', name: 'Line B fixture 1', calibratedDaysAgo: 95, dueInDays: 270, contactCyclesUsed: 3_180, voltageUncertaintyV: 0.004, currentUncertaintyA: 0.003, certificate: 'OBE-CAL-26-0311' },
  { code: 'FX-102', name: 'Line B fixture 2', calibratedDaysAgo: 120, dueInDays: 245, contactCyclesUsed: 2_470, voltageUncertaintyV: 0.005, currentUncertaintyA: 0.004, certificate: 'OBE-CAL-26-0287' },
  // due soon on purpose: the demo shows the calibration warning on EOL-3
  { code: 'FX-103', name: 'Line B fixture 3', calibratedDaysAgo: 345, dueInDays: 20, contactCyclesUsed: 4_860, voltageUncertaintyV: 0.005, currentUncertaintyA: 0.005, certificate: 'OBE-CAL-25-1190' },
] as const;

export const DEMO_STATIONS = [
  { code: 'EOL-1', name: 'End-of-line 1', location: 'Plant 2, line B', fixtureCode: 'FX-101', partNumber: 'OB-BK0503' },
  { code: 'EOL-2', name: 'End-of-line 2', location: 'Plant 2, line B', fixtureCode: 'FX-102', partNumber: 'OB-BK3305' },
  { code: 'EOL-3', name: 'End-of-line 3', location: 'Plant 2, line B', fixtureCode: 'FX-103', partNumber: 'OB-BK1202' },
] as const;

/** Units in each history lot (the HistorySeeder tests them) and in each station's current lot. */
export const HISTORY_LOT_UNITS = 220;
export const ACTIVE_LOT_UNITS = 120;

/**
 * The demo lots, oldest first. `weeksAgo` places the lot (its code and serial week) relative to the
 * week of the first seeding. History lots are for the HistorySeeder to test; the older three are
 * already released, the two recent ones still open. Active lots are each station's current lot,
 * untested, for the live demo.
 */
export const DEMO_LOTS: { partNumber: string; weeksAgo: number; purpose: 'history' | 'active'; state: LotState; units: number }[] = [
  { partNumber: 'OB-BK0503', weeksAgo: 5, purpose: 'history', state: LotState.Released, units: HISTORY_LOT_UNITS },
  { partNumber: 'OB-BK3305', weeksAgo: 4, purpose: 'history', state: LotState.Released, units: HISTORY_LOT_UNITS },
  { partNumber: 'OB-BK0503', weeksAgo: 3, purpose: 'history', state: LotState.Released, units: HISTORY_LOT_UNITS },
  { partNumber: 'OB-BK1202', weeksAgo: 2, purpose: 'history', state: LotState.Open, units: HISTORY_LOT_UNITS },
  { partNumber: 'OB-BK3305', weeksAgo: 1, purpose: 'history', state: LotState.Open, units: HISTORY_LOT_UNITS },
  { partNumber: 'OB-BK0503', weeksAgo: 0, purpose: 'active', state: LotState.Open, units: ACTIVE_LOT_UNITS },
  { partNumber: 'OB-BK3305', weeksAgo: 0, purpose: 'active', state: LotState.Open, units: ACTIVE_LOT_UNITS },
  { partNumber: 'OB-BK1202', weeksAgo: 0, purpose: 'active', state: LotState.Open, units: ACTIVE_LOT_UNITS },
];

/**
 * Users, products, fixtures, stations, lots and units of the demo plant. Idempotent: each record is
 * looked up by its unique key (username, part number, fixture code, station code) and only created
 * when missing; existing records are left as they are. Lots are dated relative to the day of seeding,
 * so their codes change week to week; a product that already has any lot therefore gets no demo lots,
 * which keeps a second run, in any week, from adding lots.
 */
export class DemoPlantSeeder extends Seeder {
  async run(em: EntityManager): Promise<void> {
    await em.transactional(async (tx) => {
      const now = new Date();
      await this.users(tx);
      const products = await this.products(tx);
      const fixtures = await this.fixtures(tx, now);
      const activeLots = await this.lots(tx, products, now);
      await this.stations(tx, fixtures, activeLots);
    });
  }

  private async users(em: EntityManager): Promise<void> {
    for (const u of DEMO_USERS) {
      if (await em.count(User, { username: u.username })) continue;
      em.create(User, { username: u.username, displayName: u.displayName, roles: u.roles, active: true, passwordHash: await hashPassword(u.password) }, { partial: true });
    }
    await em.flush();
  }

  private async products(em: EntityManager): Promise<Map<string, Product>> {
    const out = new Map<string, Product>();
    for (const p of DEMO_PRODUCTS) {
      out.set(p.partNumber, (await em.findOne(Product, { partNumber: p.partNumber })) ?? em.create(Product, { ...p, active: true }, { partial: true }));
    }
    await em.flush();
    return out;
  }

  private async fixtures(em: EntityManager, now: Date): Promise<Map<string, Fixture>> {
    const out = new Map<string, Fixture>();
    for (const f of DEMO_FIXTURES) {
      const existing = await em.findOne(Fixture, { code: f.code });
      out.set(
        f.code,
        existing ??
          em.create(
            Fixture,
            {
              code: f.code,
              name: f.name,
              portPath: `mock:${f.code}`,
              baudRate: 115_200,
              calibratedAt: new Date(now.getTime() - f.calibratedDaysAgo * DAY_MS),
              calibrationDueAt: new Date(now.getTime() + f.dueInDays * DAY_MS),
              calibrationCertificate: f.certificate,
              voltageUncertaintyV: f.voltageUncertaintyV,
              currentUncertaintyA: f.currentUncertaintyA,
              contactCyclesUsed: f.contactCyclesUsed,
              contactCyclesAllowed: 50_000,
              active: true,
            },
            { partial: true },
          ),
      );
    }
    await em.flush();
    return out;
  }

  /** Creates the demo lots and units; returns each product's active (current) lot when it was created. */
  private async lots(em: EntityManager, products: Map<string, Product>, now: Date): Promise<Map<string, Lot>> {
    const active = new Map<string, Lot>();
    const seeded = new Set<string>();
    for (const [partNumber, product] of products) {
      if (await em.count(Lot, { product })) seeded.add(partNumber);
    }
    const lotsPerWeek = new Map<string, number>();
    for (const spec of DEMO_LOTS) {
      // the same weekday as today, `weeksAgo` weeks back: its ISO week goes into the lot code and serials
      const at = new Date(now.getTime() - spec.weeksAgo * 7 * DAY_MS);
      const yearWeek = yearWeekCode(at);
      const n = (lotsPerWeek.get(yearWeek) ?? 0) + 1;
      lotsPerWeek.set(yearWeek, n);
      if (seeded.has(spec.partNumber)) continue;
      const code = `LB-${yearWeek}-${String(n).padStart(2, '0')}`;
      if (await em.count(Lot, { code })) continue;
      const { lot } = await registerLot(em, { code, product: products.get(spec.partNumber)!, plannedQuantity: spec.units, at, state: spec.state });
      lot.createdAt = at;
      if (spec.purpose === 'active') active.set(spec.partNumber, lot);
      // flush per lot so the next lot of the same product and week sees its serials as taken
      await em.flush();
    }
    return active;
  }

  private async stations(em: EntityManager, fixtures: Map<string, Fixture>, activeLots: Map<string, Lot>): Promise<void> {
    for (const s of DEMO_STATIONS) {
      if (await em.count(Station, { code: s.code })) continue;
      const fixture = fixtures.get(s.fixtureCode)!;
      // a fixture already moved to another station by hand stays where it is
      const fixtureFree = !fixture.id || !(await em.count(Station, { fixture }));
      em.create(
        Station,
        { code: s.code, name: s.name, location: s.location, fixture: fixtureFree ? fixture : undefined, activeLot: activeLots.get(s.partNumber), active: true },
        { partial: true },
      );
    }
    await em.flush();
  }
}
