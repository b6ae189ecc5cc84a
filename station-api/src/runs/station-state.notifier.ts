import { ChangeSet, ChangeSetType, EventSubscriber, FlushEventArgs } from '@mikro-orm/core';
import { EntityManager } from '@mikro-orm/sqlite';
import { Injectable, OnModuleInit } from '@nestjs/common';
import { Fixture } from '../fixtures/fixture.entity';
import { Lot } from '../lots/lot.entity';
import { PlanVersion } from '../plans/plan-version.entity';
import { TestPlan } from '../plans/test-plan.entity';
import { Station } from '../stations/station.entity';
import { RunEngineService } from './run-engine.service';

/** Ids of the records a flush wrote that a station's state depends on. */
export interface TouchedRecords {
  stations: Set<number>;
  fixtures: Set<number>;
  lots: Set<number>;
  /** Test plans (not versions) whose versions changed: releasing or retiring one changes "No released plan" */
  plans: Set<number>;
}

export function noneTouched(): TouchedRecords {
  return { stations: new Set(), fixtures: new Set(), lots: new Set(), plans: new Set() };
}

function isEmpty(t: TouchedRecords): boolean {
  return t.stations.size + t.fixtures.size + t.lots.size + t.plans.size === 0;
}

/**
 * Which of the written records matter to a station's state. Deletions are left out: a deleted station has
 * no state, and a fixture or lot still referenced by a station cannot be deleted (foreign keys).
 */
export function touchedBy(changeSets: Iterable<ChangeSet<object>>, into: TouchedRecords = noneTouched()): TouchedRecords {
  for (const cs of changeSets) {
    if (cs.type === ChangeSetType.DELETE || cs.type === ChangeSetType.DELETE_EARLY) continue;
    const e = cs.entity;
    if (e instanceof Station) into.stations.add(e.id);
    else if (e instanceof Fixture) into.fixtures.add(e.id);
    else if (e instanceof Lot) into.lots.add(e.id);
    else if (e instanceof PlanVersion && e.plan) into.plans.add(e.plan.id);
  }
  return into;
}

/**
 * Announces a fresh `station:state` for every station whose state may have changed when fixtures, stations,
 * lots or plan versions are written: a calibration recorded, contacts replaced, a fixture taken out of
 * service, a station's lot or fixture changed, a lot put on hold, a plan released. One seam for every
 * writer: it watches the ORM's flushes (a MikroORM event subscriber), so the master-data features need not
 * know about the runs feature, and a route added later is covered without further wiring.
 *
 * A flush inside a transaction is announced once the transaction commits, when other connections can see
 * it; a rolled-back transaction announces nothing. The pool holds one connection (see mikro-orm.config.ts),
 * so only one transaction is open at a time and one pending set suffices.
 *
 * Writes that bypass the unit of work (the engine's native updates of contact cycles, run rows) are not
 * seen here; the engine announces those states itself.
 */
@Injectable()
export class StationStateNotifier implements EventSubscriber, OnModuleInit {
  private pending = noneTouched();

  constructor(
    private readonly em: EntityManager,
    private readonly engine: RunEngineService,
  ) {}

  onModuleInit(): void {
    // forks (request contexts, transactions) share or clone this event manager, so they all report here
    this.em.getEventManager().registerSubscriber(this);
  }

  afterFlush({ em, uow }: FlushEventArgs): void {
    const touched = touchedBy(uow.getChangeSets());
    if (isEmpty(touched)) return;
    if (em.isInTransaction()) {
      for (const key of Object.keys(touched) as (keyof TouchedRecords)[]) touched[key].forEach((id) => this.pending[key].add(id));
      return;
    }
    this.announce(touched);
  }

  afterTransactionCommit(): void {
    if (isEmpty(this.pending)) return;
    const touched = this.pending;
    this.pending = noneTouched();
    this.announce(touched);
  }

  afterTransactionRollback(): void {
    this.pending = noneTouched();
  }

  private announce(touched: TouchedRecords): void {
    this.engine.stationStatus.announceState(this.affectedStations(touched));
  }

  /** The stations holding a touched fixture or lot, or testing a product whose plan changed, and the touched stations. */
  async affectedStations(touched: TouchedRecords): Promise<Set<number>> {
    const ids = new Set(touched.stations);
    const em = this.em.fork();
    const add = (stations: { id: number }[]) => stations.forEach((s) => ids.add(s.id));
    if (touched.fixtures.size) add(await em.find(Station, { fixture: { $in: [...touched.fixtures] } }, { fields: ['id'] }));
    if (touched.lots.size) add(await em.find(Station, { activeLot: { $in: [...touched.lots] } }, { fields: ['id'] }));
    if (touched.plans.size) {
      const plans = await em.find(TestPlan, { id: { $in: [...touched.plans] } }, { fields: ['product'] });
      const products = [...new Set(plans.map((p) => p.product.id))];
      if (products.length) add(await em.find(Station, { activeLot: { product: { $in: products } } }, { fields: ['id'] }));
    }
    return ids;
  }
}
