import { Entity, Enum, Index, ManyToOne, Property, Unique } from '@mikro-orm/core';
import { BaseEntity } from '../common/base.entity';
import { Product } from '../products/product.entity';
import { User } from '../users/user.entity';

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

  // release and close (Migration20261202152000): who moved the lot on, when and why; the audit trail has the same
  @Property({ nullable: true })
  releasedAt?: Date;

  @ManyToOne(() => User, { nullable: true })
  releasedBy?: User;

  @Property({ nullable: true })
  closedAt?: Date;

  @ManyToOne(() => User, { nullable: true })
  closedBy?: User;

  @Property({ type: 'text', nullable: true })
  closeReason?: string;
}
