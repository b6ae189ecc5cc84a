import { Entity, Enum, Index, ManyToOne, Property, Unique } from '@mikro-orm/core';
import { BaseEntity } from '../common/base.entity';
import { Product } from '../products/product.entity';

export enum LotState {
  Open = 'open',
  OnHold = 'on_hold',
  Released = 'released',
  Closed = 'closed',
}

@Entity({ tableName: 'lots' })
export class Lot extends BaseEntity {
  @Property()
  @Unique()
  code!: string;

  @ManyToOne(() => Product)
  product!: Product;

  @Property()
  plannedQuantity!: number;

  @Enum(() => LotState)
  @Index()
  state: LotState = LotState.Open;

  @Property({ nullable: true })
  holdReason?: string;
}
