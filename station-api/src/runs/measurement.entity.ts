import { Entity, Enum, Index, ManyToOne, Property } from '@mikro-orm/core';
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
 * The limits in force are copied here so the record stands alone.
 */
@Entity({ tableName: 'measurements' })
// trend of one quantity, the value included so the index alone answers it (Migration20261203030000, issue 11;
// it replaced (stepKey, quantity, measuredAt) and dropped (stepKey, measuredAt), which no reader needed)
@Index({ properties: ['stepKey', 'quantity', 'measuredAt', 'value'] })
// one quantity of the filtered runs: capability, control chart (Migration20261202155000)
@Index({ properties: ['run', 'stepKey', 'quantity', 'value'] })
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
