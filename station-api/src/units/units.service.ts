import { EntityManager } from '@mikro-orm/sqlite';
import { BadRequestException, Injectable, NotFoundException } from '@nestjs/common';
import { toProductDto } from '../products/products.service';
import type { UnitDto } from './dto/unit.dto';
import { Unit } from './unit.entity';

// longest serial any product pattern can produce here is well under this; longer input is a scan error
const MAX_SERIAL_LENGTH = 64;

export function toUnitDto(u: Unit): UnitDto {
  return {
    id: u.id,
    serial: u.serial,
    state: u.state,
    testCount: u.testCount,
    lastTestedAt: u.lastTestedAt?.toISOString() ?? null,
    sentToRepairAt: u.sentToRepairAt?.toISOString() ?? null,
    lot: { id: u.lot.id, code: u.lot.code, state: u.lot.state },
    product: toProductDto(u.product),
  };
}

/**
 * A serial as typed or scanned, made comparable: scanners may add a trailing CR or spaces, people type in lower
 * case (serials are stored in upper case, as the station's scan does). Refuses empty or over-long input.
 */
export function normalisedSerial(raw: string): string {
  const serial = raw.trim().toUpperCase();
  if (serial.length === 0 || serial.length > MAX_SERIAL_LENGTH) {
    throw new BadRequestException({ message: `A serial has 1 to ${MAX_SERIAL_LENGTH} characters; got ${serial.length}.`, details: [{ field: 'serial', problems: [`serial must have 1 to ${MAX_SERIAL_LENGTH} characters`] }] });
  }
  return serial;
}

@Injectable()
export class UnitsService {
  constructor(private readonly em: EntityManager) {}

  async getBySerial(raw: string): Promise<UnitDto> {
    const serial = normalisedSerial(raw);
    const unit = await this.em.findOne(Unit, { serial }, { populate: ['lot', 'product'] });
    if (!unit) {
      throw new NotFoundException({ message: `No unit with serial "${serial}" is registered. Check the label, or register the lot first.`, details: { code: 'unknown_serial' } });
    }
    return toUnitDto(unit);
  }
}
