import type { EntityManager } from '@mikro-orm/sqlite';
import type { Station } from '../stations/station.entity';

/*
 * What a station's readiness is worked out from, as plain data. The board reads it for every station with one
 * statement, and which products have a released plan with one more, instead of loading the stations, their
 * fixtures, lots, products and each product's released plan version (its steps JSON included) through the ORM:
 * 15 ms against 0.7 ms of SQL at a year of history (issue 11, bench:floor).
 */

export interface StationFacts {
  id: number;
  code: string;
  name: string;
  active: boolean;
  fixture: { id: number; code: string; active: boolean; calibrationDueAt: Date; contactCyclesUsed: number; contactCyclesAllowed: number } | null;
  lot: { id: number; code: string; state: string; holdReason: string | null; productId: number; partNumber: string } | null;
}

const FACTS_SQL =
  'select s.id, s.code, s.name, s.active, f.id as fixture_id, f.code as fixture_code, f.active as fixture_active, f.calibration_due_at, ' +
  'f.contact_cycles_used, f.contact_cycles_allowed, l.id as lot_id, l.code as lot_code, l.state as lot_state, l.hold_reason, ' +
  'p.id as product_id, p.part_number ' +
  'from stations s left join fixtures f on f.id = s.fixture_id left join lots l on l.id = s.active_lot_id left join products p on p.id = l.product_id';

/** A stored date: epoch milliseconds as the ORM writes them, or text from a hand-made row. */
function toDate(v: unknown): Date {
  return new Date(typeof v === 'string' && !/^\d+$/.test(v) ? v : Number(v));
}

/** SQLite keeps booleans as 0/1 (the ORM's mapping); a hand-made row may hold 'true'/'false'. */
function toBool(v: unknown): boolean {
  return v === true || v === 1 || v === '1' || v === 'true';
}

export function rowToStationFacts(r: Record<string, unknown>): StationFacts {
  return {
    id: Number(r.id),
    code: String(r.code),
    name: String(r.name),
    active: toBool(r.active),
    fixture:
      r.fixture_id === null || r.fixture_id === undefined
        ? null
        : {
            id: Number(r.fixture_id),
            code: String(r.fixture_code),
            active: toBool(r.fixture_active),
            calibrationDueAt: toDate(r.calibration_due_at),
            contactCyclesUsed: Number(r.contact_cycles_used),
            contactCyclesAllowed: Number(r.contact_cycles_allowed),
          },
    lot:
      r.lot_id === null || r.lot_id === undefined
        ? null
        : {
            id: Number(r.lot_id),
            code: String(r.lot_code),
            state: String(r.lot_state),
            holdReason: r.hold_reason === null || r.hold_reason === undefined ? null : String(r.hold_reason),
            productId: Number(r.product_id),
            partNumber: String(r.part_number),
          },
  };
}

/** The facts of the stations (only the active ones when asked), in code order as the board lists them. */
export async function stationFacts(em: EntityManager, activeOnly: boolean): Promise<StationFacts[]> {
  const rows = await em.getConnection().execute<Record<string, unknown>[]>(`${FACTS_SQL}${activeOnly ? ' where s.active = 1' : ''} order by s.code`);
  return rows.map(rowToStationFacts);
}

/** The facts of a station loaded with its fixture and active lot (with product). */
export function factsOfStation(s: Station): StationFacts {
  const f = s.fixture;
  const l = s.activeLot;
  return {
    id: s.id,
    code: s.code,
    name: s.name,
    active: s.active,
    fixture: f
      ? { id: f.id, code: f.code, active: f.active, calibrationDueAt: f.calibrationDueAt, contactCyclesUsed: f.contactCyclesUsed, contactCyclesAllowed: f.contactCyclesAllowed }
      : null,
    lot: l ? { id: l.id, code: l.code, state: l.state, holdReason: l.holdReason ?? null, productId: l.product.id, partNumber: l.product.partNumber } : null,
  };
}

/**
 * Which of the products have a released plan: a version released and not retired, of a plan of the product
 * (the condition PlansService.releasedVersionForProduct loads the version by; only its existence counts here).
 */
export async function releasedPlanProducts(em: EntityManager, productIds: number[]): Promise<Set<number>> {
  const ids = [...new Set(productIds)];
  if (ids.length === 0) return new Set();
  const rows = await em
    .getConnection()
    .execute<{ product_id: number }[]>(
      `select distinct tp.product_id from test_plans tp join plan_versions pv on pv.plan_id = tp.id ` +
        `where pv.state = 'released' and pv.retired_at is null and tp.product_id in (${ids.map(() => '?').join(', ')})`,
      ids,
    );
  return new Set(rows.map((r) => Number(r.product_id)));
}
