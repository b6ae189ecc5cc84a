import type { EntityManager } from '@mikro-orm/core';
import { ConflictException } from '@nestjs/common';
import type { Product } from '../products/product.entity';
import { MAX_SEQUENCE, parseSerialPattern, sequenceOf, serialRange, weekStem, yearWeekCode } from '../units/serial-numbers';
import { Unit } from '../units/unit.entity';
import { Lot, LotState } from './lot.entity';

export interface LotRegistration {
  code: string;
  product: Product;
  plannedQuantity: number;
  /** First sequence number; default: one past the highest already used for this product and week */
  firstSequence?: number;
  /** Registration day; its ISO week goes into the serials */
  at: Date;
  state?: LotState;
}

/**
 * Creates a lot and its units (serials prefix + YYWW + five-digit sequence, following the product's
 * pattern) in `em`; the caller flushes. Shared by the lots API and the demo seeder.
 * @throws ConflictException (details.code) when serials cannot be made or would collide
 */
export async function registerLot(em: EntityManager, r: LotRegistration): Promise<{ lot: Lot; serials: string[] }> {
  const template = parseSerialPattern(r.product.serialPattern);
  if (!template) {
    throw new ConflictException({
      message: `The serial pattern of ${r.product.partNumber} (${r.product.serialPattern}) is not of the form PREFIX-YYWW-NNNNN, so serials cannot be generated. Correct the product first.`,
      details: { code: 'serial_pattern_not_generatable' },
    });
  }
  const yearWeek = yearWeekCode(r.at);
  const stem = weekStem(template, yearWeek);
  const first = r.firstSequence ?? (await nextFreeSequence(em, stem, template));
  const last = first + r.plannedQuantity - 1;
  if (last > MAX_SEQUENCE) {
    throw new ConflictException({
      message: `Serials ${first}..${last} of week ${yearWeek} would run past ${MAX_SEQUENCE}. Lower the quantity or start the lot next week.`,
      details: { code: 'sequence_exhausted' },
    });
  }
  const serials = serialRange(template, yearWeek, first, r.plannedQuantity);
  const pattern = new RegExp(r.product.serialPattern);
  if (!serials.every((s) => pattern.test(s))) {
    // parseSerialPattern only accepts patterns it can fill in, so this is a programming error
    throw new Error(`generated serials do not match ${r.product.serialPattern}`);
  }
  // zero-padded fixed-width sequences sort as text, so a range query finds every clash
  const clash = await em.findOne(Unit, { serial: { $gte: serials[0], $lte: serials[serials.length - 1] } }, { orderBy: { serial: 'asc' } });
  if (clash) {
    throw new ConflictException({
      message: `Serial ${clash.serial} is already registered, so this lot cannot use sequences ${first}..${last}. Leave firstSequence out to take the next free ones.`,
      details: { code: 'serial_taken', serial: clash.serial },
    });
  }
  const lot = em.create(Lot, { code: r.code, product: r.product, plannedQuantity: r.plannedQuantity, state: r.state ?? LotState.Open }, { partial: true });
  for (const serial of serials) em.create(Unit, { serial, lot, product: r.product }, { partial: true });
  return { lot, serials };
}

async function nextFreeSequence(em: EntityManager, stem: string, template: NonNullable<ReturnType<typeof parseSerialPattern>>): Promise<number> {
  const highest = await em.findOne(
    Unit,
    { serial: { $gte: `${stem}00000`, $lte: `${stem}99999${template.suffix}` } },
    { orderBy: { serial: 'desc' } },
  );
  return highest ? (sequenceOf(template, highest.serial) ?? 0) + 1 : 1;
}
