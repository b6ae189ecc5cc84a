import { EntityManager } from '@mikro-orm/sqlite';
import { ConflictException, Injectable, NotFoundException } from '@nestjs/common';
import { AuditService } from '../audit/audit.service';
import type { AuthUser } from '../common/decorators/current-user.decorator';
import { LotState } from '../lots/lot.entity';
import { MailService } from '../mail/mail.service';
import { User } from '../users/user.entity';
import type { HoldAlertDto, HoldDto, HoldQueryDto, LiftHoldDto, OutboxMessageDto } from './dto/hold.dto';
import { HoldAlert } from './hold-alert.entity';
import { Hold } from './hold.entity';
import { toHoldAlertDto, toHoldDto, toOutboxMessageDto } from './hold-views';

/** Rows per list: the page shows the latest; older ones stay in the database and the audit trail. */
const LIST_LIMIT = 200;
const HOLD_POPULATE = ['lot.product', 'rule', 'run.unit', 'run.station', 'liftedBy'] as const;

/** Holds (listing and lifting), the alerts history and the outbox. */
@Injectable()
export class HoldsService {
  constructor(
    private readonly em: EntityManager,
    private readonly audit: AuditService,
    private readonly mail: MailService,
  ) {}

  async list(q: HoldQueryDto): Promise<HoldDto[]> {
    const state = q.state ?? 'all';
    const where = state === 'active' ? { liftedAt: null } : state === 'lifted' ? { liftedAt: { $ne: null } } : {};
    const holds = await this.em.find(Hold, where, { populate: HOLD_POPULATE, orderBy: { heldAt: 'desc', id: 'desc' }, limit: LIST_LIMIT });
    return holds.map(toHoldDto);
  }

  /** Lifts an active hold: the lot is open for testing again; audited with the reason. */
  async lift(id: number, dto: LiftHoldDto, actor: AuthUser): Promise<HoldDto> {
    const hold = await this.em.findOne(Hold, { id }, { populate: HOLD_POPULATE });
    if (!hold) throw new NotFoundException(`There is no hold with id ${id}.`);
    if (hold.liftedAt) {
      throw new ConflictException(`This hold on lot ${hold.lot.code} was already lifted by ${hold.liftedBy?.displayName ?? 'someone'} at ${hold.liftedAt.toISOString()}.`);
    }
    const lot = hold.lot;
    const before = { lotCode: lot.code, lotState: lot.state, holdReason: lot.holdReason ?? null };
    // a lot released or closed meanwhile keeps its state; only a held lot goes back to open
    if (lot.state === LotState.OnHold) {
      lot.state = LotState.Open;
      lot.holdReason = undefined;
    }
    hold.liftedAt = new Date();
    hold.liftedBy = this.em.getReference(User, actor.id);
    hold.liftReason = dto.reason;
    await this.audit.record(
      { actor: actor.id, action: 'hold.lifted', entityType: 'hold', entityId: hold.id, reason: dto.reason, before, after: { lotCode: lot.code, lotState: lot.state, holdReason: null } },
      this.em,
    );
    await this.em.flush();
    await this.em.populate(hold, ['liftedBy']);
    return toHoldDto(hold);
  }

  async alerts(): Promise<HoldAlertDto[]> {
    const alerts = await this.em.find(HoldAlert, {}, { populate: ['rule', 'lot', 'run'], orderBy: { id: 'desc' }, limit: LIST_LIMIT });
    return alerts.map(toHoldAlertDto);
  }

  async outbox(): Promise<OutboxMessageDto[]> {
    return (await this.mail.list(LIST_LIMIT)).map(toOutboxMessageDto);
  }
}
