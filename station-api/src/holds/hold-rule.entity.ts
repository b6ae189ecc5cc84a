import { Entity, Enum, Index, ManyToOne, Property } from '@mikro-orm/core';
import { BaseEntity } from '../common/base.entity';
import { Product } from '../products/product.entity';
import { User } from '../users/user.entity';

/** What a hold rule watches (words: hold-rule-words.ts). */
export enum HoldRuleKind {
  /** first-pass yield of the last N units below X % */
  Fpy = 'fpy',
  /** Cpk of one quantity over the last N tests below Y */
  Cpk = 'cpk',
  /** a run rule violated on the individuals chart of one quantity over the last N tests */
  RunRule = 'run_rule',
  /** K failed tests in a row at one station */
  ConsecutiveFailures = 'consecutive_failures',
}

/**
 * A condition that puts a lot of this product on hold when a finished test meets it. Only the fields of its
 * kind are set. Never deleted: switched off instead, so past holds keep the rule that tripped them.
 */
@Entity({ tableName: 'hold_rules' })
@Index({ properties: ['product', 'active'] })
export class HoldRule extends BaseEntity {
  @ManyToOne(() => Product)
  product!: Product;

  @Enum(() => HoldRuleKind)
  kind!: HoldRuleKind;

  /** N: how many of the latest units (FPY) or tests (Cpk, run rule) are looked at */
  @Property({ nullable: true })
  windowUnits?: number;

  /** X: the lowest acceptable first-pass yield, percent */
  @Property({ type: 'double', nullable: true })
  minFpyPct?: number;

  /** Y: the lowest acceptable Cpk */
  @Property({ type: 'double', nullable: true })
  minCpk?: number;

  /** Quantity watched (Cpk, run rule): the step key and the limit key within it */
  @Property({ type: 'text', nullable: true })
  stepKey?: string;

  @Property({ type: 'text', nullable: true })
  quantity?: string;

  /** Run rules evaluated (run rule kind): 'western-electric' (WE1–WE4) or 'nelson' (N1–N8) */
  @Property({ type: 'text', nullable: true })
  ruleSet?: 'western-electric' | 'nelson';

  /** K: failed tests in a row at one station */
  @Property({ nullable: true })
  failuresInRow?: number;

  @Property()
  active: boolean = true;

  @ManyToOne(() => User, { nullable: true })
  createdBy?: User;

  @Property({ nullable: true })
  switchedOffAt?: Date;

  @ManyToOne(() => User, { nullable: true })
  switchedOffBy?: User;
}
