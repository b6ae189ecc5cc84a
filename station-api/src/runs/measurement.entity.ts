import { Entity, Enum, ManyToOne, Property } from '@mikro-orm/core';
import { BaseEntity } from '../common/base.entity';
import { TestRun } from './test-run.entity';

export enum MeasurementVerdict {
  Pass = 'pass',
  Fail = 'fail',
  /** inside the specification limits, outside the guarded acceptance limits */
  GuardFail = 'guard_fail',
}

/**
 * One judged quantity. Written once, with the other measurements of its step in one transaction, as soon as
 * the step is judged; never updated.
 * The limits in force are part of the record so it stands alone.
 *
 * `measurements` is a VIEW (issue 11, Migration20261203010000, docs/storage-design.md): the row is stored in
 * `measurement_values`, its step, quantity, limits and U once in `measurement_defs`, a long capture once per
 * step in `step_captures`. The view shows today's columns, so this entity only reads; rows are written by
 * SQL INSERT into the view (runs/measurement-store.ts), never through the ORM. The indexes are on
 * `measurement_values`: (run_id, def_id, value) and (def_id, measured_at).
 */
@Entity({ tableName: 'measurements' })
export class Measurement extends BaseEntity {
  @ManyToOne(() => TestRun)
  run!: TestRun;

  @Property()
  stepIndex!: number;

  @Property()
  stepKey!: string;

  @Property()
  stepName!: string;

  /** Quantity key within the step (the limit's key) */
  @Property()
  quantity!: string;

  @Property()
  name!: string;

  @Property({ type: 'double', nullable: true })
  value?: number;

  @Property()
  unit!: string;

  @Property({ type: 'double', nullable: true })
  lowLimit?: number;

  @Property({ type: 'double', nullable: true })
  highLimit?: number;

  @Property({ type: 'double', nullable: true })
  guardedLow?: number;

  @Property({ type: 'double', nullable: true })
  guardedHigh?: number;

  @Property({ type: 'double' })
  uncertainty: number = 0;

  @Property()
  rule!: string;

  @Enum(() => MeasurementVerdict)
  verdict!: MeasurementVerdict;

  /** ILAC-G8:09/2019 §4.2.3 non-binary statement (pass, conditional_pass, conditional_fail, fail); null without a plausible value */
  @Property({ type: 'text', nullable: true })
  decision?: 'pass' | 'conditional_pass' | 'conditional_fail' | 'fail';

  /** Raw fixture readings the value was computed from (and the capture summary) */
  @Property({ type: 'json', nullable: true })
  raw?: Record<string, unknown>;

  @Property()
  startedAt!: Date;

  @Property()
  measuredAt!: Date;
}
