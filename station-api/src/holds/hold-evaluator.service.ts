import { EntityManager } from '@mikro-orm/sqlite';
import { BeforeApplicationShutdown, Injectable, Logger, OnModuleInit } from '@nestjs/common';
import { AuditService } from '../audit/audit.service';
import { Lot, LotState } from '../lots/lot.entity';
import { MailService } from '../mail/mail.service';
import type { OutboxMessage } from '../mail/outbox-message.entity';
import { StationEventsPublisher } from '../realtime/station-events.publisher';
import { TestRun } from '../runs/test-run.entity';
import { User } from '../users/user.entity';
import { HoldAlert, HoldAlertKind } from './hold-alert.entity';
import { HoldRule, HoldRuleKind } from './hold-rule.entity';
import { describeRule } from './hold-rule-words';
import { Hold } from './hold.entity';
import { firstVerdicts, liftedSinceMs, quantitySeries, runContext, stationVerdicts, type RunContext } from './rule-data';
import { judgeConsecutiveFailures, judgeCpk, judgeFpy, judgeRunRules, type RuleFinding } from './rule-evaluation';

/** What a tripped rule did (for tests and logs). */
export interface PlacedHold {
  holdId: number;
  alertId: number;
  lotId: number;
  reason: string;
  outbox: number[];
}

/**
 * Evaluates the hold rules of a run's product on the run's lot after every finished test (`run:finished`),
 * off the run's path: evaluations queue one after another in the background, and an error is logged and kept
 * as an alert, never passed back to the run. When a rule trips, one transaction puts the lot on hold, stores
 * the hold, the alert, the audit event and one outbox message per active quality user; the station states
 * follow by themselves (StationStateNotifier sees the lot written) and the e-mails go out afterwards.
 */
@Injectable()
export class HoldEvaluatorService implements OnModuleInit, BeforeApplicationShutdown {
  private readonly logger = new Logger(HoldEvaluatorService.name);
  private chain: Promise<unknown> = Promise.resolve();
  private pending = 0;
  private stopListening?: () => void;

  constructor(
    private readonly em: EntityManager,
    private readonly events: StationEventsPublisher,
    private readonly mail: MailService,
    private readonly audit: AuditService,
  ) {}

  onModuleInit(): void {
    this.stopListening = this.events.onEmitted('run:finished', (p) => {
      // pass and fail only: a stopped run or a fixture fault says nothing about the product
      if (p.verdict === 'pass' || p.verdict === 'fail') this.schedule(p.runId);
    });
  }

  async beforeApplicationShutdown(): Promise<void> {
    this.stopListening?.();
    await this.idle();
    await this.mail.idle();
  }

  /** Resolves once every scheduled evaluation has finished. */
  async idle(): Promise<void> {
    while (this.pending > 0) await this.chain;
  }

  /** Queues the evaluation of one finished run. */
  schedule(runId: number): Promise<PlacedHold | null> {
    this.pending += 1;
    const work = this.chain.then(() => this.evaluateSafely(runId));
    this.chain = work.finally(() => (this.pending -= 1));
    return work;
  }

  private async evaluateSafely(runId: number): Promise<PlacedHold | null> {
    try {
      return await this.evaluate(runId);
    } catch (err) {
      const message = (err as Error).message;
      this.logger.error(`Hold rules could not be evaluated after run ${runId}: ${message}`);
      try {
        const em = this.em.fork();
        const exists = await em.count(TestRun, { id: runId });
        em.create(
          HoldAlert,
          { kind: HoldAlertKind.EvaluationFailed, run: exists ? em.getReference(TestRun, runId) : undefined, message: `Hold rules could not be evaluated after run ${runId}: ${message}` },
          { partial: true },
        );
        await em.flush();
      } catch (recordErr) {
        this.logger.error(`The failed evaluation could not be recorded either: ${(recordErr as Error).message}`);
      }
      return null;
    }
  }

  /** Judges the active rules of the run's product, in the order they were added; the first that trips holds the lot. */
  async evaluate(runId: number): Promise<PlacedHold | null> {
    const em = this.em.fork();
    const ctx = await runContext(em, runId);
    if (!ctx || ctx.activeRules === 0 || ctx.lotState !== LotState.Open) return null;
    if (ctx.verdict !== 'pass' && ctx.verdict !== 'fail') return null;
    const rules = await em.find(HoldRule, { product: ctx.productId, active: true }, { orderBy: { id: 'asc' } });
    const since = await liftedSinceMs(em, ctx.lotId);
    for (const rule of rules) {
      const finding = await this.judge(em, rule, ctx, since);
      if (finding) return this.placeHold(rule.id, ctx, finding);
    }
    return null;
  }

  private async judge(em: EntityManager, rule: HoldRule, ctx: RunContext, since: number): Promise<RuleFinding | null> {
    switch (rule.kind) {
      case HoldRuleKind.Fpy:
        return judgeFpy(await firstVerdicts(em, ctx.lotId, since, rule.windowUnits!), rule.windowUnits!, rule.minFpyPct!);
      case HoldRuleKind.Cpk: {
        const s = await quantitySeries(em, ctx.lotId, since, rule.stepKey!, rule.quantity!, rule.windowUnits!);
        return judgeCpk(s.values, s.limits, rule.windowUnits!, rule.minCpk!, s);
      }
      case HoldRuleKind.RunRule: {
        const s = await quantitySeries(em, ctx.lotId, since, rule.stepKey!, rule.quantity!, rule.windowUnits!);
        return judgeRunRules(s.values, rule.windowUnits!, rule.ruleSet ?? 'western-electric', s);
      }
      case HoldRuleKind.ConsecutiveFailures:
        return judgeConsecutiveFailures(await stationVerdicts(em, ctx.lotId, ctx.stationId, since, rule.failuresInRow!), rule.failuresInRow!, ctx.stationCode);
    }
  }

  private async placeHold(ruleId: number, ctx: RunContext, finding: RuleFinding): Promise<PlacedHold | null> {
    let placed: PlacedHold | null = null;
    let outbox: OutboxMessage[] = [];
    await this.em.fork().transactional(async (tx) => {
      const lot = await tx.findOneOrFail(Lot, { id: ctx.lotId }, { populate: ['product'] });
      // another evaluation or a person changed the lot meanwhile
      if (lot.state !== LotState.Open) return;
      const rule = await tx.findOneOrFail(HoldRule, { id: ruleId });
      const before = { lotCode: lot.code, lotState: lot.state, holdReason: lot.holdReason ?? null };
      lot.state = LotState.OnHold;
      lot.holdReason = finding.reason;
      const figures = { ...finding.figures, runId: ctx.runId, stationCode: ctx.stationCode };
      const hold = tx.create(Hold, { lot, rule, run: tx.getReference(TestRun, ctx.runId), reason: finding.reason, figures, heldAt: new Date() }, { partial: true });
      const alert = tx.create(HoldAlert, { kind: HoldAlertKind.Hold, rule, lot, run: tx.getReference(TestRun, ctx.runId), message: `Lot ${lot.code} is on hold: ${finding.reason}`, figures }, { partial: true });
      await tx.flush();
      alert.holdId = hold.id;
      await this.audit.record(
        {
          actorName: 'hold rules',
          action: 'hold.placed',
          entityType: 'hold',
          entityId: hold.id,
          before,
          after: { lotCode: lot.code, lotState: lot.state, holdReason: lot.holdReason, ruleId: rule.id, rule: describeRule(rule), runId: ctx.runId, figures },
        },
        tx,
      );
      const quality = (await tx.find(User, { active: true }, { orderBy: { username: 'asc' } })).filter((u) => u.hasRole('quality'));
      const subject = `Lot ${lot.code} (${lot.product.partNumber}) is on hold`;
      const body = [
        `Lot ${lot.code} of ${lot.product.partNumber} was put on hold after test run ${ctx.runId} at station ${ctx.stationCode}.`,
        '',
        `Reason: ${finding.reason}`,
        `Rule: ${describeRule(rule)}`,
        '',
        'Testing of this lot is blocked until a quality user lifts the hold, with a reason, on the Holds and alerts page.',
      ].join('\n');
      outbox = this.mail.queue(tx, quality.map((u) => ({ to: this.mail.addressOf(u.username), subject, body, alertId: alert.id })));
      await tx.flush();
      placed = { holdId: hold.id, alertId: alert.id, lotId: lot.id, reason: finding.reason, outbox: outbox.map((m) => m.id) };
    });
    if (placed) {
      this.logger.log(`Lot ${ctx.lotCode} is on hold: ${finding.reason}`);
      this.mail.deliverQueued(outbox);
    }
    return placed;
  }
}
