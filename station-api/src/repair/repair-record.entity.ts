import { Entity, Enum, Index, ManyToOne, Property } from '@mikro-orm/core';
import { BaseEntity } from '../common/base.entity';
import { TestRun } from '../runs/test-run.entity';
import { Unit } from '../units/unit.entity';
import { User } from '../users/user.entity';
import { RepairCause } from './repair-cause.entity';

/** What became of the unit after the repair. */
export enum RepairDisposition {
  /** returned for retest (eligible to be tested again) */
  Retest = 'retest',
  Scrapped = 'scrapped',
}

/**
 * A repair record (issue 12): symptom, cause from the maintained list, action taken, who and when, and the
 * disposition. Never edited: a correction is a new record that points at the one it corrects (`corrects`);
 * the Pareto by cause counts only records nobody corrected.
 */
@Entity({ tableName: 'repair_records' })
@Index({ properties: ['recordedAt'] })
export class RepairRecord extends BaseEntity {
  @ManyToOne(() => Unit)
  @Index()
  unit!: Unit;

  @ManyToOne(() => RepairCause)
  @Index()
  cause!: RepairCause;

  @Property({ type: 'text' })
  symptom!: string;

  @Property({ type: 'text' })
  actionTaken!: string;

  @Enum(() => RepairDisposition)
  disposition!: RepairDisposition;

  @ManyToOne(() => User)
  technician!: User;

  @Property()
  recordedAt: Date = new Date();

  /** the unit's last failing run when the record was written (null: none stored) */
  @ManyToOne(() => TestRun, { nullable: true })
  failedRun?: TestRun;

  /** the record this one corrects (null: an original record) */
  @ManyToOne(() => RepairRecord, { nullable: true })
  @Index()
  corrects?: RepairRecord;

  /** why the correction was made (corrections only) */
  @Property({ type: 'text', nullable: true })
  correctionReason?: string;
}
