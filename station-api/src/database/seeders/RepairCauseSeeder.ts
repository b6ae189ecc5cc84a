import type { EntityManager } from '@mikro-orm/core';
import { Seeder } from '@mikro-orm/seeder';
import { RepairCause } from '../../repair/repair-cause.entity';

/**
 * The starting list of repair causes for the invented Orrin Bay Electronics line (engineers maintain it from
 * the Repair page). Causes a buck converter module's rework bench meets; the team's own wording.
 */
export const DEMO_REPAIR_CAUSES = [
  'Solder bridge',
  'Cold joint',
  'Wrong component value',
  'Component missing',
  'Component rotated or reversed',
  'Cracked inductor',
  'Damaged output capacitor',
  'Feedback divider out of tolerance',
  'Switching transistor damaged',
  'Lifted pad or broken trace',
  'Connector or pin bent',
  'Contamination or flux residue',
  'No fault found',
] as const;

/** Idempotent: adds only the causes not there yet (compared without case), never renames or switches one back on. */
export class RepairCauseSeeder extends Seeder {
  async run(em: EntityManager): Promise<void> {
    const existing = new Set((await em.find(RepairCause, {})).map((c) => c.name.toLowerCase()));
    for (const name of DEMO_REPAIR_CAUSES) {
      if (!existing.has(name.toLowerCase())) em.persist(em.create(RepairCause, { name, active: true }));
    }
    await em.flush();
  }
}
