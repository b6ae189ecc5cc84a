import { Entity, Index, ManyToOne, Property } from '@mikro-orm/core';
import { BaseEntity } from '../common/base.entity';
import { User } from '../users/user.entity';

/** Append-only record of who did what, when and why. */
@Entity({ tableName: 'audit_events' })
@Index({ properties: ['entityType', 'entityId'] })
export class AuditEvent extends BaseEntity {
  @Property()
  @Index()
  at: Date = new Date();

  @ManyToOne(() => User, { nullable: true })
  actor?: User;

  /** Name as given (for failed sign-ins the user may not exist) */
  @Property({ nullable: true })
  actorName?: string;

  @Property()
  @Index()
  action!: string;

  @Property()
  entityType!: string;

  @Property({ nullable: true })
  entityId?: string;

  @Property({ type: 'text', nullable: true })
  reason?: string;

  @Property({ type: 'json', nullable: true })
  before?: Record<string, unknown>;

  @Property({ type: 'json', nullable: true })
  after?: Record<string, unknown>;
}
