import { Collection, Entity, Enum, Index, ManyToOne, OneToMany, Property } from '@mikro-orm/core';
import { BaseEntity } from '../common/base.entity';
import { CalibrationRecord } from '../fixtures/calibration/calibration-record.entity';
import { Fixture } from '../fixtures/fixture.entity';
import { Lot } from '../lots/lot.entity';
import { PlanVersion } from '../plans/plan-version.entity';
import { Product } from '../products/product.entity';
import { Station } from '../stations/station.entity';
import { Unit } from '../units/unit.entity';
import { User } from '../users/user.entity';
import { Measurement } from './measurement.entity';

export enum RunVerdict {
  Running = 'running',
  Pass = 'pass',
  Fail = 'fail',
  /** fixture or software fault: the unit was not judged */
  Error = 'error',
  Aborted = 'aborted',
}

/** Why a run ended without a judged verdict (see `RunEndReasonName` in the live-event contract). */
export enum RunEndReason {
  OperatorStop = 'operator_stop',
  ServerShutdown = 'server_shutdown',
  /** found running at start-up: the server stopped during it */
  Interrupted = 'interrupted',
  FixtureFault = 'fixture_fault',
  SoftwareFault = 'software_fault',
  ImplausibleReading = 'implausible_reading',
  StoreFailed = 'store_failed',
}

/** One test of one unit on one station. Lot and product are copied for fast yield queries. */
@Entity({ tableName: 'test_runs' })
@Index({ properties: ['lot', 'startedAt'] })
@Index({ properties: ['station', 'startedAt'] })
@Index({ properties: ['fixture', 'startedAt'] })
@Index({ properties: ['product', 'startedAt'] })
// issue 11 (Migration20261202140000): board and shift summary, repair queue, runs list by verdict
@Index({ properties: ['station', 'finishedAt'] })
@Index({ properties: ['unit', 'verdict'] })
@Index({ properties: ['verdict', 'startedAt'] })
// issue 12 (Migration20261202155000): first and latest judged run of a unit
@Index({ properties: ['unit', 'attempt'] })
// issue 11, runs list sorts (Migration20261203030000): each sort read from an index; the operator-name (nocase),
// duration (expression) and units serial (nocase) indexes are created there only (MikroORM cannot declare them)
@Index({ properties: ['attempt', 'startedAt'] })
@Index({ properties: ['failedStepKey', 'startedAt'] })
@Index({ properties: ['planVersion', 'startedAt'] })
// at most one running run per unit and per station: partial unique indexes created by Migration20261202130000
// (MikroORM cannot declare a partial index on an entity)
export class TestRun extends BaseEntity {
  @ManyToOne(() => Unit)
  unit!: Unit;

  @ManyToOne(() => Lot)
  lot!: Lot;

  @ManyToOne(() => Product)
  product!: Product;

  @ManyToOne(() => Station)
  station!: Station;

  @ManyToOne(() => Fixture)
  fixture!: Fixture;

  @ManyToOne(() => PlanVersion)
  planVersion!: PlanVersion;

  @ManyToOne(() => User)
  operator!: User;

  /** The operator's display name when the run started; views show it, so renaming a user changes no past run */
  @Property({ type: 'text', nullable: true })
  operatorName?: string;

  /** 1 for the first test of the unit, 2 for the first retest, ... */
  @Property()
  attempt!: number;

  @Enum(() => RunVerdict)
  verdict: RunVerdict = RunVerdict.Running;

  @Property()
  @Index()
  startedAt: Date = new Date();

  @Property({ nullable: true })
  finishedAt?: Date;

  /** First failing step key, for Pareto charts (indexed with startedAt, see the class) */
  @Property({ nullable: true })
  failedStepKey?: string;

  @Property({ type: 'text', nullable: true })
  errorMessage?: string;

  /** Why the run ended without a judged verdict; null for pass, fail and running */
  @Enum({ items: () => RunEndReason, nullable: true })
  endReason?: RunEndReason;

  /** Snapshot of the fixture at start: identification reply, calibration due date, cycle count */
  @Property({ nullable: true })
  fixtureIdentity?: string;

  @Property({ nullable: true })
  fixtureCalibrationDueAt?: Date;

  @Property({ nullable: true })
  fixtureContactCycles?: number;

  /** The fixture calibration whose uncertainties the run was judged with (Migration20261202151000); null for older runs */
  @ManyToOne(() => CalibrationRecord, { nullable: true })
  calibration?: CalibrationRecord;

  /** Engineer override for retesting an already-passed unit */
  @Property({ type: 'text', nullable: true })
  overrideReason?: string;

  @ManyToOne(() => User, { nullable: true })
  overrideBy?: User;

  @OneToMany(() => Measurement, (m) => m.run)
  measurements = new Collection<Measurement>(this);
}
