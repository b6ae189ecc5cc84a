import { EntityManager } from '@mikro-orm/sqlite';
import { ConflictException, Injectable, NotFoundException } from '@nestjs/common';
import { createHash } from 'node:crypto';
import { AuditService } from '../audit/audit.service';
import type { AuthUser } from '../common/decorators/current-user.decorator';
import { User } from '../users/user.entity';
import type { CloseLotDto, LotDetailDto, ReleaseBlockerDto, ReleaseCheckDto, ReleaseLotDto } from './dto/lot.dto';
import { renderCertificate } from './certificate.pdf';
import { LotCertificate } from './lot-certificate.entity';
import { LotCertificateService } from './lot-certificate.service';
import { Lot, LotState } from './lot.entity';
import { LotsService } from './lots.service';

/** Serials named with each blocker, so a person can go and find the units. */
const SERIALS_SHOWN = 20;

const units = (n: number) => (n === 1 ? '1 unit' : `${n} units`);

/**
 * Releasing a lot (when every unit has a final pass or was scrapped and no hold is active), its certificate of
 * conformance, and closing a released lot.
 */
@Injectable()
export class LotReleaseService {
  constructor(
    private readonly em: EntityManager,
    private readonly audit: AuditService,
    private readonly lots: LotsService,
    private readonly certificates: LotCertificateService,
  ) {}

  /** What stops the lot from being released, in plain words; empty when it may be released. */
  async blockers(lot: Lot, em: EntityManager = this.em): Promise<ReleaseBlockerDto[]> {
    const out: ReleaseBlockerDto[] = [];
    if (lot.state === LotState.OnHold) out.push({ code: 'lot_on_hold', message: `Lot is on hold: ${lot.holdReason ?? 'no reason was recorded'}. A quality user lifts the hold first.` });
    if (lot.state === LotState.Released) out.push({ code: 'lot_released', message: `The lot was already released${lot.releasedAt ? ` on ${lot.releasedAt.toISOString().slice(0, 10)}` : ''}.` });
    if (lot.state === LotState.Closed) out.push({ code: 'lot_closed', message: 'The lot is closed.' });
    // inside a transaction the queries must run on its connection (the pool holds one)
    const query = <T>(sql: string, params: unknown[]) => em.getConnection().execute(sql, params, 'all', em.getTransactionContext()) as Promise<T[]>;
    const rows = await query<{ state: string; serial: string }>(`select state, serial from units where lot_id = ? and state not in ('passed', 'scrapped') order by serial`, [lot.id]);
    const total = (await query<{ n: number }>('select count(*) as n from units where lot_id = ?', [lot.id]))[0]?.n ?? 0;
    if (Number(total) === 0) out.push({ code: 'no_units', message: 'The lot has no units.' });
    const of = (state: string) => rows.filter((r) => r.state === state).map((r) => r.serial);
    const untested = of('untested');
    const failed = of('failed');
    const inRepair = of('in_repair');
    const some = (s: string[]) => s.slice(0, SERIALS_SHOWN);
    if (untested.length) out.push({ code: 'units_untested', message: `${units(untested.length)} not yet tested`, serials: some(untested) });
    if (failed.length) out.push({ code: 'units_failed', message: `${units(failed.length)} failed and not scrapped or retested`, serials: some(failed) });
    if (inRepair.length) out.push({ code: 'units_in_repair', message: `${units(inRepair.length)} in repair, neither retested nor scrapped`, serials: some(inRepair) });
    const running = await query<{ serial: string }>(`select u.serial from test_runs r join units u on u.id = r.unit_id where r.lot_id = ? and r.verdict = 'running' order by u.serial`, [lot.id]);
    if (running.length) out.push({ code: 'units_under_test', message: `${units(running.length)} being tested right now`, serials: some(running.map((r) => r.serial)) });
    return out;
  }

  async check(id: number): Promise<ReleaseCheckDto> {
    const lot = await this.lots.getEntity(id);
    const blockers = await this.blockers(lot);
    return { releasable: blockers.length === 0, blockers };
  }

  /**
   * Releases the lot and issues its certificate of conformance (stored as bytes). Refused with 409 and the list
   * of blockers when any unit is open or the lot is not open for testing.
   */
  async release(id: number, dto: ReleaseLotDto, actor: AuthUser): Promise<LotDetailDto> {
    const lot = await this.lots.getEntity(id);
    const refuse = (blockers: ReleaseBlockerDto[]) =>
      new ConflictException({
        message: `Lot ${lot.code} cannot be released yet: ${blockers.map((b) => b.message.replace(/\.$/, '')).join('; ')}.`,
        details: { code: 'lot_not_releasable', blockers },
      });
    const first = await this.blockers(lot);
    if (first.length) throw refuse(first);
    const at = new Date();
    const comment = dto.comment?.trim() || null;
    const content = await this.certificates.content(lot, { by: actor.displayName, at, comment });
    const pdf = await renderCertificate(content);
    const sha256 = createHash('sha256').update(pdf).digest('hex');
    await this.em.transactional(async (em) => {
      const fresh = await em.findOneOrFail(Lot, { id }, { populate: ['product'] });
      // a run may have finished or a hold tripped while the certificate was drawn up
      const again = await this.blockers(fresh, em);
      if (again.length) throw refuse(again);
      fresh.state = LotState.Released;
      fresh.releasedAt = at;
      fresh.releasedBy = em.getReference(User, actor.id);
      const cert = em.create(LotCertificate, {
        lot: fresh,
        issuedAt: at,
        issuedBy: em.getReference(User, actor.id),
        issuedByName: actor.displayName,
        comment: comment ?? undefined,
        fileName: `certificate-of-conformance-${lot.code}.pdf`,
        sha256,
        pdf,
      }, { partial: true });
      await em.flush();
      await this.audit.record(
        {
          actor: actor.id,
          action: 'lot.released',
          entityType: 'lot',
          entityId: fresh.id,
          reason: comment ?? undefined,
          before: { state: LotState.Open },
          after: { state: fresh.state, certificateNo: content.certificateNo, certificateSha256: sha256, certificateId: cert.id, passed: content.quantities.passed, scrapped: content.quantities.scrapped },
        },
        em,
      );
    });
    return this.lots.get(id);
  }

  /** Closes a released lot (quality or admin), with a reason. */
  async close(id: number, dto: CloseLotDto, actor: AuthUser): Promise<LotDetailDto> {
    const reason = dto.reason.trim();
    await this.em.transactional(async (em) => {
      const lot = await em.findOne(Lot, { id });
      if (!lot) throw new NotFoundException({ message: `There is no lot with id ${id}.`, details: { code: 'unknown_lot' } });
      if (lot.state !== LotState.Released) {
        const words: Record<LotState, string> = { open: 'still open for testing', on_hold: 'on hold', released: 'released', closed: 'already closed' };
        throw new ConflictException({ message: `Lot ${lot.code} is ${words[lot.state]}; only a released lot can be closed.`, details: { code: 'lot_not_released', state: lot.state } });
      }
      lot.state = LotState.Closed;
      lot.closedAt = new Date();
      lot.closedBy = em.getReference(User, actor.id);
      lot.closeReason = reason;
      await this.audit.record({ actor: actor.id, action: 'lot.closed', entityType: 'lot', entityId: lot.id, reason, before: { state: LotState.Released }, after: { state: LotState.Closed } }, em);
      await em.flush();
    });
    return this.lots.get(id);
  }

  /** The certificate issued by the release: the stored bytes, unchanged. */
  async certificate(id: number): Promise<{ fileName: string; sha256: string; pdf: Buffer }> {
    const lot = await this.lots.getEntity(id);
    const cert = await this.em.findOne(LotCertificate, { lot: lot.id }, { populate: ['pdf'] });
    if (!cert) {
      const why = lot.state === LotState.Released || lot.state === LotState.Closed ? 'it was released before certificates were issued' : 'it has not been released';
      throw new NotFoundException({ message: `Lot ${lot.code} has no certificate of conformance: ${why}.`, details: { code: 'no_certificate' } });
    }
    return { fileName: cert.fileName, sha256: cert.sha256, pdf: Buffer.from(cert.pdf) };
  }
}
