import { Entity, Property, Unique } from '@mikro-orm/core';
import { BaseEntity } from '../common/base.entity';

export const ROLES = ['operator', 'engineer', 'quality', 'admin'] as const;
export type Role = (typeof ROLES)[number];

@Entity({ tableName: 'users' })
export class User extends BaseEntity {
  @Property()
  @Unique()
  username!: string;

  @Property()
  displayName!: string;

  /** bcrypt hash; never serialised */
  @Property({ hidden: true, lazy: false })
  passwordHash!: string;

  @Property({ type: 'json' })
  roles: Role[] = [];

  @Property()
  active: boolean = true;

  hasRole(...wanted: Role[]): boolean {
    return wanted.some((r) => this.roles.includes(r));
  }
}
