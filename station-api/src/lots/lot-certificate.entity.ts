import { Entity, ManyToOne, OneToOne, Property } from '@mikro-orm/core';
import { BaseEntity } from '../common/base.entity';
import { User } from '../users/user.entity';
import { Lot } from './lot.entity';

/**
 * The certificate of conformance made when a lot was released. The PDF bytes are stored, not re-rendered, so
 * every download is the document that was issued (its SHA-256 is kept beside it and sent as a header).
 */
@Entity({ tableName: 'lot_certificates' })
export class LotCertificate extends BaseEntity {
  @OneToOne(() => Lot, { owner: true, unique: true })
  lot!: Lot;

  @Property()
  issuedAt!: Date;

  @ManyToOne(() => User)
  issuedBy!: User;

  /** The releasing person's display name at the time; the PDF prints it */
  @Property()
  issuedByName!: string;

  @Property({ type: 'text', nullable: true })
  comment?: string;

  @Property()
  fileName!: string;

  /** SHA-256 of `pdf`, hex */
  @Property()
  sha256!: string;

  @Property({ type: 'blob', lazy: true })
  pdf!: Buffer;
}
