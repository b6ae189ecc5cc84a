import { Entity, Property, Unique } from '@mikro-orm/core';
import { BaseEntity } from '../common/base.entity';

/** A DC-DC module type (one part number). */
@Entity({ tableName: 'products' })
export class Product extends BaseEntity {
  @Property()
  @Unique()
  partNumber!: string;

  @Property()
  name!: string;

  @Property()
  family!: string;

  @Property({ type: 'double' })
  vinMinV!: number;

  @Property({ type: 'double' })
  vinNomV!: number;

  @Property({ type: 'double' })
  vinMaxV!: number;

  @Property({ type: 'double' })
  voutNomV!: number;

  @Property({ type: 'double' })
  ioutRatedA!: number;

  /** JavaScript regular expression (anchored) every serial of this product must match */
  @Property()
  serialPattern!: string;

  @Property()
  active: boolean = true;
}
