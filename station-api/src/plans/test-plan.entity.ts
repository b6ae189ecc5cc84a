import { Collection, Entity, ManyToOne, OneToMany, Property, Unique } from '@mikro-orm/core';
import { BaseEntity } from '../common/base.entity';
import { Product } from '../products/product.entity';
import { PlanVersion } from './plan-version.entity';

/** A test plan for one product; its content lives in numbered versions. */
@Entity({ tableName: 'test_plans' })
export class TestPlan extends BaseEntity {
  @Property()
  @Unique()
  code!: string;

  @Property()
  name!: string;

  @ManyToOne(() => Product)
  product!: Product;

  @OneToMany(() => PlanVersion, (v) => v.plan)
  versions = new Collection<PlanVersion>(this);
}
