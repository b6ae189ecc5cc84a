import { Entity, Enum, Index, ManyToOne, Property, Unique } from '@mikro-orm/core';
import { BaseEntity } from '../common/base.entity';
import { Lot } from '../lots/lot.entity';
import { Product } from '../products/product.entity';

export enum UnitState {
  Untested = 'untested',
  Passed = 'passed',
  Failed = 'failed',
  InRepair = 'in_repair',
  Scrapped = 'scrapped',
}

/** One manufactured module, identified by its serial. */
@Entity({ tableName: 'units' })
export class Unit extends BaseEntity {
  @Property()
  @Unique()
  serial!: string;

  @ManyToOne(() => Lot)
  lot!: Lot;

  @ManyToOne(() => Product)
  product!: Product;

  @Enum(() => UnitState)
  @Index()
  state: UnitState = UnitState.Untested;

  /** Number of completed runs (pass or fail) on this unit */
  @Property()
  testCount: number = 0;

  @Property({ nullable: true })
  lastTestedAt?: Date;

  /**
   * `testCount` when repair last returned the unit for retest (0 if never): the retest limit counts only
   * attempts above this, so a repaired unit gets a fresh set while run attempts stay numbered globally.
   */
  @Property()
  testCountAtReturn: number = 0;

  /**
   * When the operator sent the failed unit to repair with attempts still left (null: not sent). Cleared when
   * repair returns it for retest. A unit with no attempts left is on the queue without it.
   */
  @Property({ nullable: true })
  sentToRepairAt?: Date;
}
