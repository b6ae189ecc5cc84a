import type { EntityManager as CoreEntityManager } from '@mikro-orm/core';
import { FixtureLinkService } from '../fixtures/transport/fixture-link.service';
import { createStandaloneEngine, type StandaloneEngine } from '../runs/standalone-engine';
import { FixtureSimulation } from './fixture-simulation';

export interface SimulatedEngine extends StandaloneEngine {
  simulation: FixtureSimulation;
}

/**
 * The standalone run engine (no Nest) on simulated fixtures, for the history seeder and the benchmark.
 * The fixtures run with instant timing and a short command timeout: a reply they drop (intermittent
 * contact) is then noticed in milliseconds instead of the fixture's 2 s.
 */
export function createSimulatedEngine(
  em: CoreEntityManager,
  options: { commandTimeoutMs?: number; namespace?: string; inProcess?: boolean } = {},
): SimulatedEngine {
  const links = new FixtureLinkService({ commandTimeoutMs: options.commandTimeoutMs ?? 100, lateReplyGraceMs: 10 });
  const simulation = new FixtureSimulation(links, {
    timing: 'instant',
    // its own simulated fixtures, even if a server in the same process has attached some
    namespace: options.namespace ?? 'standalone',
    inProcess: options.inProcess,
  });
  return { ...createStandaloneEngine(em, links), simulation };
}
