import { Entity, Property, Unique } from '@mikro-orm/core';
import { BaseEntity } from '../common/base.entity';

/**
 * One entry of the list of repair causes that engineers maintain (issue 12). A cause in use is never deleted:
 * it is switched off (`active` false), so old repair records keep their cause and the Pareto by cause its bars.
 */
@Entity({ tableName: 'repair_causes' })
export class RepairCause extends BaseEntity {
  /** unique, compared without regard to case */
  @Property()
  @Unique()
  name!: string;

  /** false: switched off, no longer offered for new repair records */
  @Property()
  active: boolean = true;
}
