import { Entity, Enum, Index, Property } from '@mikro-orm/core';
import { BaseEntity } from '../common/base.entity';

export enum OutboxStatus {
  Queued = 'queued',
  Sent = 'sent',
  Failed = 'failed',
}

/**
 * One e-mail the server sent or tried to send: the lasting record behind the outbox page. Written before
 * the first attempt, so a message is never lost between "decided to send" and "sent".
 */
@Entity({ tableName: 'outbox_messages' })
@Index({ properties: ['createdAt'] })
export class OutboxMessage extends BaseEntity {
  @Property({ type: 'text' })
  toAddress!: string;

  @Property({ type: 'text' })
  subject!: string;

  @Property({ type: 'text' })
  body!: string;

  @Enum(() => OutboxStatus)
  @Index()
  status: OutboxStatus = OutboxStatus.Queued;

  @Property()
  attempts: number = 0;

  /** The SMTP server's (or the connection's) error of the last failed attempt */
  @Property({ type: 'text', nullable: true })
  lastError?: string;

  @Property({ nullable: true })
  lastAttemptAt?: Date;

  @Property({ nullable: true })
  sentAt?: Date;

  /** The alert this message announces (hold_alerts.id), if any */
  @Property({ nullable: true })
  alertId?: number;
}
