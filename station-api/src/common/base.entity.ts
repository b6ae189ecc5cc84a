import { OptionalProps, PrimaryKey, Property } from '@mikro-orm/core';

/** Shared columns: a numeric id and creation / update times (UTC). */
export abstract class BaseEntity<Optional = never> {
  /** set by the ORM; not required by em.create() */
  [OptionalProps]?: 'createdAt' | 'updatedAt' | Optional;

  @PrimaryKey({ autoincrement: true })
  id!: number;

  @Property({ onCreate: () => new Date() })
  createdAt: Date = new Date();

  @Property({ onUpdate: () => new Date(), onCreate: () => new Date() })
  updatedAt: Date = new Date();
}
