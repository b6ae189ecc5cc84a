import { Entity, ManyToOne, Property, Unique } from '@mikro-orm/core';
import { BaseEntity } from '../common/base.entity';
import { Fixture } from '../fixtures/fixture.entity';
import { Lot } from '../lots/lot.entity';

/** A test position on the line: one fixture, one active lot at a time. */
@Entity({ tableName: 'stations' })
export class Station extends BaseEntity {
  @Property()
  @Unique()
  code!: string;

  @Property()
  name!: string;

  @Property({ nullable: true })
  location?: string;

  @ManyToOne(() => Fixture, { nullable: true })
  fixture?: Fixture;

  @ManyToOne(() => Lot, { nullable: true })
  activeLot?: Lot;

  @Property()
  active: boolean = true;
}
