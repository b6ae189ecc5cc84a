import { Entity, Index, ManyToOne, Property } from '@mikro-orm/core';
import { BaseEntity } from '../common/base.entity';
import { Lot } from '../lots/lot.entity';
import { TestRun } from '../runs/test-run.entity';
import { User } from '../users/user.entity';
import { HoldRule } from './hold-rule.entity';

/** One time a lot was put on hold by a rule, and (once lifted) who lifted it, when and why. */
@Entity({ tableName: 'holds' })
@Index({ properties: ['lot', 'liftedAt'] })
export class Hold extends BaseEntity {
  @ManyToOne(() => Lot)
  lot!: Lot;

  @ManyToOne(() => HoldRule)
  rule!: HoldRule;

  /** The finished test whose evaluation tripped the rule */
  @ManyToOne(() => TestRun, { nullable: true })
  run?: TestRun;

  /** In plain words, as the station shows it */
  @Property({ type: 'text' })
  reason!: string;

  /** The figures behind the reason (see RuleFinding in rule-evaluation.ts) */
  @Property({ type: 'json' })
  figures!: Record<string, unknown>;

  @Property()
  heldAt: Date = new Date();

  @Property({ nullable: true })
  liftedAt?: Date;

  @ManyToOne(() => User, { nullable: true })
  liftedBy?: User;

  @Property({ type: 'text', nullable: true })
  liftReason?: string;
}
