import type { EntityManager } from '@mikro-orm/core';
import type { Product } from '../products/product.entity';
import { Unit } from '../units/unit.entity';
import { Lot, LotState } from './lot.entity';

/** SQLite binds at most 999 parameters per statement in older builds; stay well under it. */
const CHUNK = 500;

/** Of the given lot codes, those already used. */
export async function takenLotCodes(em: EntityManager, codes: readonly string[]): Promise<Set<string>> {
  const out = new Set<string>();
  for (let i = 0; i < codes.length; i += CHUNK) {
    const found = await em.find(Lot, { code: { $in: codes.slice(i, i + CHUNK) } }, { fields: ['code'] });
    for (const l of found) out.add(l.code);
  }
  return out;
}

/** Of the given serials, those already registered, with the lot that holds each. */
export async function takenSerials(em: EntityManager, serials: readonly string[]): Promise<Map<string, string>> {
  const out = new Map<string, string>();
  for (let i = 0; i < serials.length; i += CHUNK) {
    const found = await em.find(Unit, { serial: { $in: serials.slice(i, i + CHUNK) } }, { populate: ['lot'], fields: ['serial', 'lot.code'] });
    for (const u of found) out.set(u.serial, u.lot.code);
  }
  return out;
}

/** "K5A-2649-00003 (lot LB-2648-01)" and "… and 7 more": what a refusal names. */
export function describeTaken(taken: Map<string, string>): string {
  const list = [...taken.entries()].sort(([a], [b]) => a.localeCompare(b));
  const shown = list.slice(0, 3).map(([s, lot]) => `${s} (lot ${lot})`).join(', ');
  return list.length > 3 ? `${shown} and ${list.length - 3} more` : shown;
}

/**
 * Creates a lot with exactly these serials (already checked against the product's format, the lot code and
 * taken serials by the caller) in `em`; the caller flushes.
 */
export function createLotWithSerials(em: EntityManager, r: { code: string; product: Product; plannedQuantity: number; serials: readonly string[] }): Lot {
  const lot = em.create(Lot, { code: r.code, product: r.product, plannedQuantity: r.plannedQuantity, state: LotState.Open }, { partial: true });
  for (const serial of r.serials) em.create(Unit, { serial, lot, product: r.product }, { partial: true });
  return lot;
}
