import { BeforeUpdate, Entity, Enum, type EventArgs, ManyToOne, Property, Unique } from '@mikro-orm/core';
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

  /** When the draft was put forward for release; cleared when the draft is edited again */
  @Property({ nullable: true })
  submittedAt?: Date;

  @ManyToOne(() => User, { nullable: true })
  submittedBy?: User;

  /** What changed and why, given on submission; the approver reads it in the release form */
  @Property({ type: 'text', nullable: true })
  changeReason?: string;

  /** A retired version is kept with its history but no station runs it and no draft is released over it */
  @Property({ nullable: true })
  retiredAt?: Date;

  @ManyToOne(() => User, { nullable: true })
  retiredBy?: User;

  @Property({ type: 'text', nullable: true })
  retireReason?: string;

  /** Plan-file header fields with no other home, kept so an imported file exports with the same content */
  @Property({ type: 'text', nullable: true })
  author?: string;

  @Property({ nullable: true })
  fileRevision?: number;

  /**
   * A released version is never changed: once a version has left the draft state only its state may move on,
   * and only released → superseded. Checked here so that no code path (API, engine, seeder) can slip past it.
   */
  @BeforeUpdate()
  protected refuseChangeAfterRelease(args: EventArgs<PlanVersion>): void {
    const original = args.changeSet?.originalEntity as { state?: PlanVersionState } | undefined;
    if (!original?.state || original.state === PlanVersionState.Draft) return;
    const payload = (args.changeSet?.payload ?? {}) as Record<string, unknown>;
    const changed = Object.keys(payload).filter((k) => FROZEN_AFTER_RELEASE.has(k));
    const badMove = 'state' in payload && !(original.state === PlanVersionState.Released && payload.state === PlanVersionState.Superseded);
    if (changed.length > 0 || badMove) {
      throw new Error(
        `Plan version ${this.version} is ${original.state} and cannot change (${[...changed, ...(badMove ? ['state'] : [])].join(', ')}); create a new version instead.`,
      );
    }
  }
}

/** Fields fixed once a version is released (state, retirement and the timestamps of the base entity may still move). */
const FROZEN_AFTER_RELEASE = new Set([
  'plan',
  'version',
  'reason',
  'stopAtFirstFailure',
  'maxAttempts',
  'steps',
  'checksum',
  'sourceFile',
  'createdBy',
  'releasedBy',
  'releasedAt',
  'submittedAt',
  'submittedBy',
  'changeReason',
  'author',
  'fileRevision',
]);
