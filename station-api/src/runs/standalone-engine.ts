import type { EntityManager as CoreEntityManager } from '@mikro-orm/core';
import type { EntityManager } from '@mikro-orm/sqlite';
import { AuditService } from '../audit/audit.service';
import { FixtureLinkService } from '../fixtures/transport/fixture-link.service';
import { PlansService } from '../plans/plans.service';
import { StationEventsPublisher } from '../realtime/station-events.publisher';
import { RunEngineService } from './run-engine.service';

export interface StandaloneEngine {
  engine: RunEngineService;
  links: FixtureLinkService;
  events: StationEventsPublisher;
  /** Makes every fixture safe and closes the links */
  close(): Promise<void>;
}

/**
 * The real run engine without Nest: its collaborators built by hand on a given EntityManager, talking to
 * the fixtures through the given links (which transports serve which port paths is the caller's choice;
 * the simulation module's `createSimulatedEngine` gives simulated fixtures). Used by the history seeder
 * (which runs inside MikroORM's seeder, outside any Nest context) and by the benchmark.
 */
export function createStandaloneEngine(em: CoreEntityManager, links: FixtureLinkService): StandaloneEngine {
  const events = new StationEventsPublisher();
  const sqlEm = em as EntityManager;
  const plans = new PlansService(sqlEm, new AuditService(sqlEm));
  const engine = new RunEngineService(sqlEm, links, events, plans);
  return {
    engine,
    links,
    events,
    close: async () => {
      await engine.idle();
      await links.shutdown();
    },
  };
}
