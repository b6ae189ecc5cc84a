import { Entity, ManyToOne, Property } from '@mikro-orm/core';
import { BaseEntity } from '../common/base.entity';
import { Product } from '../products/product.entity';
import { User } from '../users/user.entity';
import type { CharacterizationColumn } from './characterization-csv';

/**
 * Per-unit measurements of a pilot build, uploaded as a CSV (docs/characterization-data.md) and kept whole so that
 * limits can be derived from it later and the audit trail can name it. Never edited after upload: a corrected
 * file is a new data set.
 */
@Entity({ tableName: 'characterization_data_sets' })
export class CharacterizationDataSet extends BaseEntity {
  /** Name the engineer gave it, unique, e.g. "OB-BK0503 pilot build P2, Nov 2026" */
  @Property({ unique: true })
  name!: string;

  /** Name of the uploaded file */
  @Property()
  fileName!: string;

  /** Product the pilot units are, when the engineer said so */
  @ManyToOne(() => Product, { nullable: true })
  product?: Product;

  @ManyToOne(() => User)
  uploadedBy!: User;

  @Property()
  uploadedAt: Date = new Date();

  /** Units (data rows) in the file */
  @Property()
  rowCount!: number;

  /** Quantity columns with their unit and count of values */
  @Property({ type: 'json' })
  columns!: CharacterizationColumn[];

  /** Serial of each unit, in file (build) order */
  @Property({ type: 'json' })
  serials!: string[];

  /** Values per column key, one per unit in file order, null where the cell was empty */
  @Property({ type: 'json' })
  values!: Record<string, (number | null)[]>;
}
