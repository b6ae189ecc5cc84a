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
 * The real run engine without Nest: its collaborators built by hand on a given EntityManager. Used by the
 * history seeder (which runs inside MikroORM's seeder, outside any Nest context) and by the benchmark.
 * Simulated fixtures run with instant timing and a short command timeout: a reply they drop (intermittent
 * contact) is then noticed in milliseconds instead of the fixture's 2 s.
 */
export function createStandaloneEngine(
  em: CoreEntityManager,
  options: { commandTimeoutMs?: number; simNamespace?: string; simulatorInProcess?: boolean } = {},
): StandaloneEngine {
  const links = new FixtureLinkService({
    simTiming: 'instant',
    commandTimeoutMs: options.commandTimeoutMs ?? 100,
    lateReplyGraceMs: 10,
    // its own simulated fixtures, even if a server in the same process has attached some
    simNamespace: options.simNamespace ?? 'standalone',
    simulatorInProcess: options.simulatorInProcess,
  });
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
