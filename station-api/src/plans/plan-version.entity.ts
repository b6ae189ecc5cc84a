import { Entity, Enum, Index, ManyToOne, Property, Unique } from '@mikro-orm/core';
import { BaseEntity } from '../common/base.entity';
import { User } from '../users/user.entity';
import { TestPlan } from './test-plan.entity';
import type { PlanStep } from './plan-definition';

export enum PlanVersionState {
  Draft = 'draft',
  Released = 'released',
  Superseded = 'superseded',
}

/** One immutable revision of a plan once released. */
@Entity({ tableName: 'plan_versions' })
@Unique({ properties: ['plan', 'version'] })
export class PlanVersion extends BaseEntity {
  @ManyToOne(() => TestPlan)
  plan!: TestPlan;

  @Property()
  version!: number;

  @Enum(() => PlanVersionState)
  state: PlanVersionState = PlanVersionState.Draft;

  /** Why this revision exists (required for every change) */
  @Property({ type: 'text' })
  reason!: string;

  @Property()
  stopAtFirstFailure: boolean = false;

  /** Maximum runs a unit may have before it must go to repair */
  @Property()
  maxAttempts: number = 3;

  @Property({ type: 'json' })
  steps!: PlanStep[];

  /** SHA-256 of the canonical step JSON, printed on reports */
  @Property()
  checksum!: string;

  @Property({ nullable: true })
  sourceFile?: string;

  @ManyToOne(() => User, { nullable: true })
  createdBy?: User;

  @ManyToOne(() => User, { nullable: true })
  releasedBy?: User;

  @Property({ nullable: true })
  releasedAt?: Date;
}
