import type { EntityManager } from '@mikro-orm/core';
import { Seeder } from '@mikro-orm/seeder';
import { CalibrationRecord } from '../../fixtures/calibration/calibration-record.entity';
import { Fixture } from '../../fixtures/fixture.entity';
import { User } from '../../users/user.entity';

const DAY_MS = 86_400_000;
/** A calibration interval of one year: common practice for bench meters, no source */
const INTERVAL_DAYS = 365;

/**
 * Per-quantity uncertainties of the demo certificates. They restate the demo plans' planning values for the
 * quantity each station tests (test-plans/*.plan.yaml), so seeding records changes no guard band; the ripple
 * value is the scope channel's own.
 */
const DEMO_CERTIFICATE_UNCERTAINTIES: Record<string, Record<string, number>> = {
  'FX-101': { voutV: 0.01, rippleMvPp: 1 },
  'FX-102': { voutV: 0.008, rippleMvPp: 1 },
  'FX-103': { voutV: 0.02, rippleMvPp: 1 },
};

/**
 * Calibration records for the demo fixtures: the certificate before the current one, a year earlier, and the
 * current one matching the fixture's columns (DemoPlantSeeder sets those; FX-103 falls due within the warning
 * window, so the demo shows the warning). Idempotent: a fixture with any record is left alone.
 */
export class CalibrationSeeder extends Seeder {
  async run(em: EntityManager): Promise<void> {
    const engineer = await em.findOne(User, { username: 'engineer' });
    for (const f of await em.find(Fixture, { code: { $in: Object.keys(DEMO_CERTIFICATE_UNCERTAINTIES) } })) {
      if (await em.count(CalibrationRecord, { fixture: f })) continue;
      const uncertainties = DEMO_CERTIFICATE_UNCERTAINTIES[f.code];
      const calibratedAt = f.calibratedAt ?? new Date(f.calibrationDueAt.getTime() - INTERVAL_DAYS * DAY_MS);
      const year = (d: Date) => String(d.getUTCFullYear() % 100).padStart(2, '0');
      const previousAt = new Date(calibratedAt.getTime() - INTERVAL_DAYS * DAY_MS);
      em.create(CalibrationRecord, {
        fixture: f,
        calibratedAt: previousAt,
        dueAt: calibratedAt,
        recordedBy: engineer ?? undefined,
        certificateNumber: `OBE-CAL-${year(previousAt)}-${String(100 + f.id).padStart(4, '0')}`,
        voltageUncertaintyV: f.voltageUncertaintyV,
        currentUncertaintyA: f.currentUncertaintyA,
        uncertainties,
        createdAt: previousAt,
        updatedAt: previousAt,
      });
      em.create(CalibrationRecord, {
        fixture: f,
        calibratedAt,
        dueAt: f.calibrationDueAt,
        recordedBy: engineer ?? undefined,
        certificateNumber: f.calibrationCertificate ?? undefined,
        voltageUncertaintyV: f.voltageUncertaintyV,
        currentUncertaintyA: f.currentUncertaintyA,
        uncertainties,
        createdAt: calibratedAt,
        updatedAt: calibratedAt,
      });
    }
    await em.flush();
  }
}
