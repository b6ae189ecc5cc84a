import type { OutboxMessage } from '../mail/outbox-message.entity';
import type { HoldAlertDto, HoldDto, OutboxMessageDto } from './dto/hold.dto';
import type { HoldRuleDto } from './dto/hold-rule.dto';
import type { HoldAlert } from './hold-alert.entity';
import type { HoldRule } from './hold-rule.entity';
import { describeRule } from './hold-rule-words';
import type { Hold } from './hold.entity';

const iso = (d?: Date | null) => (d ? d.toISOString() : null);

/** Expects product and createdBy loaded. */
export function toHoldRuleDto(r: HoldRule): HoldRuleDto {
  return {
    id: r.id,
    productId: r.product.id,
    partNumber: r.product.partNumber,
    kind: r.kind,
    description: describeRule(r),
    windowUnits: r.windowUnits ?? null,
    minFpyPct: r.minFpyPct ?? null,
    minCpk: r.minCpk ?? null,
    stepKey: r.stepKey ?? null,
    quantity: r.quantity ?? null,
    ruleSet: r.ruleSet ?? null,
    failuresInRow: r.failuresInRow ?? null,
    active: r.active,
    createdByName: r.createdBy?.displayName ?? null,
    createdAt: r.createdAt.toISOString(),
    switchedOffAt: iso(r.switchedOffAt),
  };
}

/** Expects lot.product, rule, run.unit, run.station and liftedBy loaded. */
export function toHoldDto(h: Hold): HoldDto {
  return {
    id: h.id,
    lotId: h.lot.id,
    lotCode: h.lot.code,
    lotState: h.lot.state,
    partNumber: h.lot.product.partNumber,
    ruleId: h.rule.id,
    ruleDescription: describeRule(h.rule),
    reason: h.reason,
    figures: h.figures,
    runId: h.run?.id ?? null,
    serial: h.run?.unit?.serial ?? null,
    stationCode: h.run?.station?.code ?? null,
    heldAt: h.heldAt.toISOString(),
    liftedAt: iso(h.liftedAt),
    liftedByName: h.liftedBy?.displayName ?? null,
    liftReason: h.liftReason ?? null,
  };
}

/** Expects rule and lot loaded. */
export function toHoldAlertDto(a: HoldAlert): HoldAlertDto {
  return {
    id: a.id,
    kind: a.kind,
    at: a.createdAt.toISOString(),
    message: a.message,
    ruleId: a.rule?.id ?? null,
    ruleDescription: a.rule ? describeRule(a.rule) : null,
    lotCode: a.lot?.code ?? null,
    runId: a.run?.id ?? null,
    holdId: a.holdId ?? null,
    figures: a.figures ?? null,
  };
}

export function toOutboxMessageDto(m: OutboxMessage): OutboxMessageDto {
  return {
    id: m.id,
    to: m.toAddress,
    subject: m.subject,
    body: m.body,
    status: m.status,
    attempts: m.attempts,
    lastError: m.lastError ?? null,
    createdAt: m.createdAt.toISOString(),
    lastAttemptAt: iso(m.lastAttemptAt),
    sentAt: iso(m.sentAt),
    alertId: m.alertId ?? null,
  };
}
