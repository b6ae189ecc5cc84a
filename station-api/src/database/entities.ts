import { AuditEvent } from '../audit/audit-event.entity';
import { Fixture } from '../fixtures/fixture.entity';
import { Lot } from '../lots/lot.entity';
import { PlanVersion } from '../plans/plan-version.entity';
import { TestPlan } from '../plans/test-plan.entity';
import { Product } from '../products/product.entity';
import { Measurement } from '../runs/measurement.entity';
import { TestRun } from '../runs/test-run.entity';
import { Station } from '../stations/station.entity';
import { Unit } from '../units/unit.entity';
import { User } from '../users/user.entity';
// repair records and causes (H6, issue 12)
import { RepairCause } from '../repair/repair-cause.entity';
import { RepairRecord } from '../repair/repair-record.entity';

/** Every entity, listed explicitly so the CLI, Nest and the tests see the same set. */
export const ENTITIES = [
  User,
  Product,
  Fixture,
  Lot,
  Station,
  Unit,
  TestPlan,
  PlanVersion,
  TestRun,
  Measurement,
  AuditEvent,
  // repair records and causes (H6, issue 12)
  RepairCause,
  RepairRecord,
];
