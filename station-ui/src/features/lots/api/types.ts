/* What the lots endpoints answer (station-api/src/lots/dto/lot.dto.ts), typed by hand until the OpenAPI types are regenerated. */

export type LotState = 'open' | 'on_hold' | 'released' | 'closed';
export type UnitState = 'untested' | 'passed' | 'failed' | 'in_repair' | 'scrapped';

export interface UnitCounts {
  untested: number;
  passed: number;
  failed: number;
  in_repair: number;
  scrapped: number;
  total: number;
}

export interface Lot {
  id: number;
  code: string;
  state: LotState;
  holdReason: string | null;
  plannedQuantity: number;
  product: { id: number; partNumber: string; name: string };
  createdAt: string;
  unitCounts: UnitCounts;
  releasedAt: string | null;
  releasedBy: string | null;
  closedAt: string | null;
  closedBy: string | null;
  closeReason: string | null;
  hasCertificate: boolean;
}

export interface LotDetail extends Lot {
  firstSerial: string | null;
  lastSerial: string | null;
}

export interface LotUnit {
  serial: string;
  state: UnitState;
  testCount: number;
  lastTestedAt: string | null;
}

export interface ReleaseBlocker {
  code: string;
  message: string;
  serials?: string[];
}

export interface ReleaseCheck {
  releasable: boolean;
  blockers: ReleaseBlocker[];
}

export interface LotFileProblem {
  row: number;
  column: string;
  message: string;
}

export interface LotImportResult {
  imported: number;
  lots: Lot[];
}

export interface ProductChoice {
  id: number;
  partNumber: string;
  name: string;
  serialPattern: string;
  active: boolean;
}

/** How the serials of a new lot are given. */
export type NewLotSerials = { kind: 'next' } | { kind: 'range'; firstSerial: string; lastSerial: string } | { kind: 'list'; serials: string[] };

export interface NewLot {
  code: string;
  productId: number;
  plannedQuantity: number;
  serials: NewLotSerials;
}
