import type { EntityManager } from '@mikro-orm/core';
import { Seeder } from '@mikro-orm/seeder';
import { DEMO_DEFECT_RATES, defectFor, hashString, type DefectRates, type SimulatorConfig } from '@railwright/mock-fixture';
import { loadEnv } from '../../config/env.validation';
import { Lot, LotState } from '../../lots/lot.entity';
import { VirtualClock } from '../../runs/engine-clock';
import type { RunEngineService, RunOutcome, RunRequester } from '../../runs/run-engine.service';
import { createSimulatedEngine, type SimulatedEngine } from '../../simulation/simulated-engine';
import { RunVerdict, TestRun } from '../../runs/test-run.entity';
import { Station } from '../../stations/station.entity';
import { Unit } from '../../units/unit.entity';
import { User } from '../../users/user.entity';

const HOUR_MS = 3_600_000;
const DAY_MS = 24 * HOUR_MS;
/** History covers about the last three weeks */
const HISTORY_DAYS = 21;
/** Days between the starts of consecutive lots' testing */
const LOT_SPACING_DAYS = 4;
/** Shift hours (UTC): testing happens between these */
const SHIFT_START_H = 6;
const SHIFT_END_H = 22;
/** Share of each lot tested on its product's own station; the rest goes to the next station */
const PRIMARY_SHARE = 0.7;
/** Index (oldest first) of the lot with a bad batch of parts, noticeably worse than the others */
const WORSE_LOT = 2;
/** Of the units whose first run suffered an intermittent contact, the share that passes once re-seated */
const RESEATED_PASS_SHARE = 0.6;

/**
 * Test history for the demo: runs the real run engine (its collaborators built by hand, no Nest) against
 * simulated fixtures with instant timing, over the five history lots, as it would have happened over the
 * last three weeks on the three stations. Every run gets its times from a virtual clock passed into the
 * engine; no row is edited afterwards.
 *
 * - Each lot is split between its product's station (70 %) and the next one, in day shifts 06:00–22:00 UTC,
 *   20–40 s per unit at the station.
 * - Defects come from the simulator's demo rates (about 3 % of units); lot 3 has a bad capacitor and switch
 *   batch (several times the rates).
 * - Every unit that failed or ended in error is retested once after the lot, on the product's station; a
 *   unit that had an intermittent contact passes once re-seated in 60 % of cases.
 * - While a lot is tested it is made open and active on its stations, as it was then; afterwards its state
 *   and the stations' current lots are put back.
 *
 * Skipped when SEED_HISTORY=0 or when any run exists (idempotent). Commits use SQLite's synchronous=NORMAL
 * during seeding only (generated demo data; a power cut means seeding again) and the previous setting after.
 */
export class HistorySeeder extends Seeder {
  async run(em: EntityManager): Promise<void> {
    if (loadEnv().SEED_HISTORY === '0') return;
    if ((await em.count(TestRun, {})) > 0) return;
    const started = Date.now();

    const stations = await em.find(Station, { fixture: { $ne: null } }, { populate: ['fixture', 'activeLot.product'], orderBy: { code: 'asc' } });
    const operator = await em.findOne(User, { username: 'operator' });
    if (stations.length === 0 || !operator) {
      console.warn('History not seeded: the demo stations or the operator account are missing.');
      return;
    }
    const activeLotIds = new Set(stations.map((s) => s.activeLot?.id).filter((id): id is number => id !== undefined));
    const candidates = await em.find(Lot, { id: { $nin: [...activeLotIds] } }, { populate: ['product'], orderBy: { createdAt: 'asc', id: 'asc' } });
    const lots: Lot[] = [];
    for (const lot of candidates) {
      if ((await em.count(Unit, { lot, testCount: { $gt: 0 } })) === 0) lots.push(lot);
    }
    const history = lots.slice(-5);
    if (history.length === 0) return;

    const conn = em.getConnection();
    const before = ((await conn.execute('PRAGMA synchronous')) as { synchronous: number }[])[0]?.synchronous ?? 2;
    await conn.execute('PRAGMA synchronous = NORMAL');
    const standalone = createSimulatedEngine(em, { namespace: 'history', inProcess: true });
    const requester: RunRequester = { id: operator.id, roles: [...operator.roles], displayName: operator.displayName };
    const original = stations.map((s) => ({ id: s.id, activeLot: s.activeLot?.id ?? null }));
    const lotStates = history.map((l) => ({ id: l.id, state: l.state }));
    const rates: DefectRates = { ...DEMO_DEFECT_RATES };
    const worse: DefectRates = { ...rates, aged_output_cap: 0.035, weak_switch: 0.025, wrong_feedback: 0.012 };
    const config: SimulatorConfig = {
      defectRates: rates,
      ...(history[WORSE_LOT] ? { lots: { [history[WORSE_LOT].code]: { defectRates: worse } } } : {}),
    };
    let runs = 0;
    try {
      for (const s of stations) standalone.links.linkFor(s.fixture!);
      const now = Date.now();
      for (let i = 0; i < history.length; i++) {
        const lot = history[i];
        const primary = stations.find((s) => s.activeLot?.product.id === lot.product.id) ?? stations[i % stations.length];
        const secondary = stations[(stations.indexOf(primary) + 1) % stations.length];
        const earliest = Math.max(lot.createdAt.getTime() + DAY_MS, now - HISTORY_DAYS * DAY_MS + i * LOT_SPACING_DAYS * DAY_MS);
        const windowStart = atShiftStart(new Date(earliest));
        runs += await this.testLot(em, standalone.engine, standalone.simulation, { lot, primary, secondary, requester, config, windowStart });
      }
    } finally {
      const tx = em.fork();
      for (const o of original) await tx.nativeUpdate(Station, { id: o.id }, { activeLot: o.activeLot } as never);
      for (const l of lotStates) await tx.nativeUpdate(Lot, { id: l.id }, { state: l.state });
      await standalone.close();
      await conn.execute(`PRAGMA synchronous = ${Number(before)}`);
    }
    console.log(`History seeded: ${runs} runs over ${history.length} lots in ${((Date.now() - started) / 1000).toFixed(1)} s.`);
  }

  private async testLot(
    em: EntityManager,
    engine: RunEngineService,
    simulation: SimulatedEngine['simulation'],
    plan: { lot: Lot; primary: Station; secondary: Station; requester: RunRequester; config: SimulatorConfig; windowStart: Date },
  ): Promise<number> {
    const { lot, primary, secondary, requester, config } = plan;
    // as it was then: the lot open and running on both stations
    const tx = em.fork();
    await tx.nativeUpdate(Lot, { id: lot.id }, { state: LotState.Open });
    await tx.nativeUpdate(Station, { id: { $in: [primary.id, secondary.id] } }, { activeLot: lot.id } as never);
    for (const s of [primary, secondary]) await simulation.reconfigure(s.fixture!.code, config);

    const units = await em.fork().find(Unit, { lot: lot.id }, { orderBy: { serial: 'asc' }, fields: ['id', 'serial'] });
    const clocks = new Map([primary, secondary].map((s) => [s.id, new VirtualClock(plan.windowStart)]));
    const needRetest: string[] = [];
    let runs = 0;
    const runOne = async (station: Station, serial: string, handlingS: [number, number]): Promise<RunOutcome | undefined> => {
      const clock = clocks.get(station.id)!;
      clock.set(inShift(clock.now()));
      try {
        const started = await engine.start({ stationId: station.id, serial, requester, safetyConfirmed: true, audit: false, clock });
        const outcome = await started.done;
        runs++;
        return outcome;
      } catch (err) {
        // a refusal here is a seeding bug, not a reason to lose the rest of the history
        console.warn(`History: ${serial} on ${station.code} was refused: ${(err as Error).message}`);
        return undefined;
      } finally {
        clock.elapse(between(serial, handlingS[0], handlingS[1]) * 1000);
      }
    };

    // both stations test their share at the same time, as on the line (and so seeding uses the time the
    // database spends committing)
    const share = (station: Station) => units.filter((u) => (fraction(`${u.serial}|station`) < PRIMARY_SHARE ? primary : secondary) === station);
    await Promise.all(
      [primary, secondary].map(async (station) => {
        for (const u of share(station)) {
          const outcome = await runOne(station, u.serial, [20, 40]);
          if (outcome && outcome.verdict !== RunVerdict.Pass) needRetest.push(u.serial);
        }
      }),
    );
    needRetest.sort();

    if (needRetest.length > 0) {
      // retests after triage: a re-seated unit with a bad contact mostly passes; real defects fail again
      const reseated = Object.fromEntries(
        needRetest
          .filter((s) => defectFor(s, lot.code, config) === 'intermittent_contact' && fraction(`${s}|reseat`) < RESEATED_PASS_SHARE)
          .map((s) => [s, 'good' as const]),
      );
      await simulation.reconfigure(primary.fixture!.code, { ...config, serials: reseated });
      const clock = clocks.get(primary.id)!;
      const latest = Math.max(...[...clocks.values()].map((c) => c.now().getTime()));
      clock.set(new Date(latest + 45 * 60_000));
      for (const serial of needRetest) await runOne(primary, serial, [60, 120]);
    }
    return runs;
  }
}

/** A deterministic number in [0, 1) from a text (so a reseed gives the same history). */
function fraction(text: string): number {
  return hashString(text) / 4294967296;
}

function between(text: string, lo: number, hi: number): number {
  return lo + (hi - lo) * fraction(text);
}

/** 06:00 UTC on the day of `d` */
function atShiftStart(d: Date): Date {
  return new Date(Date.UTC(d.getUTCFullYear(), d.getUTCMonth(), d.getUTCDate(), SHIFT_START_H));
}

/** `d` if it falls in a shift, else the start of the next shift. */
function inShift(d: Date): Date {
  const h = d.getUTCHours();
  if (h >= SHIFT_START_H && h < SHIFT_END_H) return d;
  const day = atShiftStart(d);
  return h < SHIFT_START_H ? day : new Date(day.getTime() + DAY_MS);
}
