import { Entity, Enum, Index, ManyToOne, Property } from '@mikro-orm/core';
import { BaseEntity } from '../common/base.entity';
import { Lot } from '../lots/lot.entity';
import { TestRun } from '../runs/test-run.entity';
import { HoldRule } from './hold-rule.entity';

export enum HoldAlertKind {
  /** a rule tripped and the lot went on hold */
  Hold = 'hold',
  /** the rules could not be evaluated after a test (the test itself is unaffected) */
  EvaluationFailed = 'evaluation_failed',
}

/** Something quality should know about: a rule that tripped, or an evaluation that failed. */
@Entity({ tableName: 'hold_alerts' })
@Index({ properties: ['createdAt'] })
export class HoldAlert extends BaseEntity {
  @Enum(() => HoldAlertKind)
  kind!: HoldAlertKind;

  @ManyToOne(() => HoldRule, { nullable: true })
  rule?: HoldRule;

  @ManyToOne(() => Lot, { nullable: true })
  lot?: Lot;

  @ManyToOne(() => TestRun, { nullable: true })
  run?: TestRun;

  /** hold created with this alert */
  @Property({ nullable: true })
  holdId?: number;

  @Property({ type: 'text' })
  message!: string;

  @Property({ type: 'json', nullable: true })
  figures?: Record<string, unknown>;
}
