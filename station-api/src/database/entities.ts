import { AuditEvent } from '../audit/audit-event.entity';
import { CalibrationRecord } from '../fixtures/calibration/calibration-record.entity';
import { Fixture } from '../fixtures/fixture.entity';
import { Lot } from '../lots/lot.entity';
import { LotCertificate } from '../lots/lot-certificate.entity';
import { PlanVersion } from '../plans/plan-version.entity';
import { TestPlan } from '../plans/test-plan.entity';
import { Product } from '../products/product.entity';
import { Measurement } from '../runs/measurement.entity';
import { TestRun } from '../runs/test-run.entity';
import { Station } from '../stations/station.entity';
import { Unit } from '../units/unit.entity';
import { User } from '../users/user.entity';
// holds and alerts (issue 12)
import { HoldAlert } from '../holds/hold-alert.entity';
import { HoldRule } from '../holds/hold-rule.entity';
import { Hold } from '../holds/hold.entity';
import { OutboxMessage } from '../mail/outbox-message.entity';
// H1: limits from characterization data (issue 10)
import { CharacterizationDataSet } from '../characterization/characterization-data-set.entity';
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
  // lots (issue 12): the certificate of conformance issued by a release
  LotCertificate,
  // holds and alerts (issue 12)
  HoldRule,
  Hold,
  HoldAlert,
  OutboxMessage,
  CharacterizationDataSet, // H1
  // fixtures and calibration (issue 10, H2)
  CalibrationRecord,
  // repair records and causes (H6, issue 12)
  RepairCause,
  RepairRecord,
];
