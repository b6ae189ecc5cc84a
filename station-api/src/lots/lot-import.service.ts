import { EntityManager } from '@mikro-orm/sqlite';
import { BadRequestException, Injectable } from '@nestjs/common';
import { AuditService } from '../audit/audit.service';
import type { AuthUser } from '../common/decorators/current-user.decorator';
import { Product } from '../products/product.entity';
import { Unit } from '../units/unit.entity';
import type { LotDto, LotImportResultDto, LotQueryDto } from './dto/lot.dto';
import { createLotWithSerials, describeTaken, takenLotCodes, takenSerials } from './lot-creation';
import { formatLotFile, MAX_LOT_FILE_BYTES, parseLotFile, type LotFileProblem, type ProductForImport } from './lot-csv';
import { LotsService } from './lots.service';

export interface UploadedLotFile {
  originalname: string;
  buffer: Buffer;
  size: number;
}

/** A refused file: 400 with every problem (row, column, why); nothing was imported. */
function refusal(name: string, problems: LotFileProblem[]): BadRequestException {
  const rows = new Set(problems.map((p) => p.row)).size;
  return new BadRequestException({
    message: `${name} was refused: ${problems.length} ${problems.length === 1 ? 'problem' : 'problems'} in ${rows} ${rows === 1 ? 'row' : 'rows'}. Nothing was imported; correct the file and upload it again.`,
    details: { code: 'lot_file_refused', problems },
  });
}

/** Lot files (lot-csv.ts): import all or nothing, and the lots list as the same file. */
@Injectable()
export class LotImportService {
  constructor(
    private readonly em: EntityManager,
    private readonly audit: AuditService,
    private readonly lots: LotsService,
  ) {}

  async importFile(file: UploadedLotFile | undefined, actor: AuthUser): Promise<LotImportResultDto> {
    if (!file) throw new BadRequestException({ message: 'No file: send the lot file as multipart form field "file".', details: { code: 'lot_file_refused', problems: [{ row: 0, column: '(file)', message: 'no file was sent' }] } });
    const name = file.originalname || 'The lot file';
    if (file.size === 0) throw refusal(name, [{ row: 0, column: '(file)', message: 'the file is empty' }]);
    if (file.size > MAX_LOT_FILE_BYTES) throw refusal(name, [{ row: 0, column: '(file)', message: `the file is larger than ${MAX_LOT_FILE_BYTES / 1_000_000} MB; split it` }]);
    let text: string;
    try {
      text = new TextDecoder('utf-8', { fatal: true }).decode(file.buffer);
    } catch {
      throw refusal(name, [{ row: 0, column: '(file)', message: 'the file is not UTF-8 text; save it as "CSV UTF-8" and upload it again' }]);
    }
    const products = await this.em.find(Product, {});
    const byPart = new Map<string, ProductForImport>(products.map((p) => [p.partNumber, { partNumber: p.partNumber, serialPattern: p.serialPattern, active: p.active }]));
    const { rows, problems } = parseLotFile(text, byPart);

    return this.em.transactional(async (em) => {
      // checks against what is stored, inside the transaction that creates the lots
      const codes = await takenLotCodes(em, rows.map((r) => r.code));
      const taken = await takenSerials(em, rows.flatMap((r) => r.serials));
      for (const r of rows) {
        if (codes.has(r.code)) problems.push({ row: r.row, column: 'lot_code', message: `lot code ${r.code} is already used` });
        const mine = new Map([...taken].filter(([s]) => r.serials.includes(s)));
        if (mine.size) problems.push({ row: r.row, column: 'serials', message: `${mine.size === 1 ? 'serial' : `${mine.size} serials`} already registered: ${describeTaken(mine)}` });
      }
      if (problems.length) throw refusal(name, problems.sort((a, b) => a.row - b.row));
      const productOf = new Map(products.map((p) => [p.partNumber, p]));
      const created = rows.map((r) => ({ row: r, lot: createLotWithSerials(em, { code: r.code, product: productOf.get(r.partNumber)!, plannedQuantity: r.plannedQuantity, serials: r.serials }) }));
      await em.flush();
      for (const { row, lot } of created) {
        await this.audit.record(
          {
            actor: actor.id,
            action: 'lot.created',
            entityType: 'lot',
            entityId: lot.id,
            reason: `imported from ${name}, row ${row.row}`,
            after: { code: lot.code, productId: lot.product.id, plannedQuantity: lot.plannedQuantity, state: lot.state, firstSerial: row.serials[0], lastSerial: row.serials[row.serials.length - 1], serialsGiven: 'file' },
          },
          em,
        );
      }
      await em.flush();
      const ids = new Set(created.map((c) => c.lot.id));
      return { ids };
    }).then(async ({ ids }) => {
      const all = await this.lots.list({});
      const lots: LotDto[] = all.filter((l) => ids.has(l.id)).sort((a, b) => a.id - b.id);
      return { imported: lots.length, lots };
    });
  }

  /** The lots list (with the list's filters) as a lot file. */
  async exportFile(query: LotQueryDto): Promise<string> {
    const lots = await this.lots.list(query);
    const serialsByLot = new Map<number, string[]>();
    if (lots.length) {
      const units = await this.em.find(Unit, { lot: { $in: lots.map((l) => l.id) } }, { fields: ['serial', 'lot'], orderBy: { serial: 'asc' } });
      for (const u of units) {
        const list = serialsByLot.get(u.lot.id);
        if (list) list.push(u.serial);
        else serialsByLot.set(u.lot.id, [u.serial]);
      }
    }
    return formatLotFile(
      lots.map((l) => ({
        code: l.code,
        partNumber: l.product.partNumber,
        plannedQuantity: l.plannedQuantity,
        serials: serialsByLot.get(l.id) ?? [],
        state: l.state,
        registered: l.unitCounts.total,
        tested: l.unitCounts.total - l.unitCounts.untested,
        passed: l.unitCounts.passed,
        createdAt: l.createdAt,
      })),
    );
  }
}
