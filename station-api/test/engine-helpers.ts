import type { SimulatorConfig } from '@railwright/mock-fixture';
import request from 'supertest';
import { Fixture } from '../src/fixtures/fixture.entity';
import { FixtureLinkService } from '../src/fixtures/transport/fixture-link.service';
import { FixtureSimulation } from '../src/simulation/fixture-simulation';
import type { SimulatorHandle } from '../src/simulation/simulated-fixtures';
import type { RunFinishedPayload, StationEventMap, StationEventName } from '../src/realtime/station-events';
import { StationEventsPublisher } from '../src/realtime/station-events.publisher';
import { RunEngineService } from '../src/runs/run-engine.service';
import { Station } from '../src/stations/station.entity';
import { Unit, UnitState } from '../src/units/unit.entity';
import type { TestApp } from './create-test-app';

/** Helpers shared by the engine, runs, realtime and pty e2e tests. */
export class EngineHarness {
  readonly events: { name: StationEventName; payload: StationEventMap[StationEventName] }[] = [];

  constructor(
    readonly t: TestApp,
    readonly token: string,
  ) {
    this.publisher.subscribe((name, payload) => this.events.push({ name, payload }));
  }

  get publisher(): StationEventsPublisher {
    return this.t.app.get(StationEventsPublisher);
  }

  get engine(): RunEngineService {
    return this.t.app.get(RunEngineService);
  }

  get links(): FixtureLinkService {
    return this.t.app.get(FixtureLinkService);
  }

  get simulation(): FixtureSimulation {
    return this.t.app.get(FixtureSimulation);
  }

  http() {
    return request(this.t.app.getHttpServer());
  }

  /** The station with its fixture and active lot. */
  async station(code: string): Promise<Station> {
    return this.t.orm.em.fork().findOneOrFail(Station, { code }, { populate: ['fixture', 'activeLot.product'] });
  }

  /** Untested serials of the station's active lot, skipping `skip` of them (each test takes its own). */
  async freshSerials(stationCode: string, count: number, skip = 0): Promise<string[]> {
    const s = await this.station(stationCode);
    const units = await this.t.orm.em
      .fork()
      .find(Unit, { lot: s.activeLot!.id, state: UnitState.Untested, testCount: 0 }, { orderBy: { serial: 'asc' }, limit: count, offset: skip });
    return units.map((u) => u.serial);
  }

  /** Gives the station's simulated fixture a defect configuration (closes the link so it takes effect). */
  async simulate(fixtureCode: string, config: SimulatorConfig, timing: 'instant' | 'realistic' = 'instant'): Promise<SimulatorHandle> {
    return this.simulation.reconfigure(fixtureCode, config, timing);
  }

  /** Changes a fixture's settings in the database and rebuilds its link (a fresh simulator with default defects). */
  async setFixture(code: string, patch: Partial<Pick<Fixture, 'commandTimeoutMs' | 'calibrationDueAt' | 'contactCyclesUsed' | 'portPath'>>): Promise<Fixture> {
    const em = this.t.orm.em.fork();
    const f = await em.findOneOrFail(Fixture, { code });
    Object.assign(f, patch);
    await em.flush();
    this.links.linkFor(f);
    return f;
  }

  /** Starts a run over REST and resolves with its run:finished event. */
  async run(stationId: number, serial: string, extra: Record<string, unknown> = {}, token = this.token): Promise<RunFinishedPayload & { status: number }> {
    const res = await this.http().post(`/api/stations/${stationId}/runs`).set('Authorization', `Bearer ${token}`).send({ serial, safetyConfirmed: true, ...extra });
    if (res.status !== 201) throw new Error(`start refused: ${res.status} ${JSON.stringify(res.body)}`);
    const finished = await this.finished(res.body.run.id);
    return { ...finished, status: res.status };
  }

  /** Resolves with the run:finished event of a run (already seen or still to come). */
  finished(runId: number, timeoutMs = 20_000): Promise<RunFinishedPayload> {
    const seen = this.events.find((e) => e.name === 'run:finished' && (e.payload as RunFinishedPayload).runId === runId);
    if (seen) return Promise.resolve(seen.payload as RunFinishedPayload);
    return new Promise((resolve, reject) => {
      const timer = setTimeout(() => {
        stop();
        reject(new Error(`run ${runId} did not finish within ${timeoutMs} ms`));
      }, timeoutMs);
      const stop = this.publisher.subscribe((name, payload) => {
        if (name === 'run:finished' && (payload as RunFinishedPayload).runId === runId) {
          clearTimeout(timer);
          stop();
          resolve(payload as RunFinishedPayload);
        }
      });
    });
  }

  /** GET /api/runs/:id */
  async detail(runId: number) {
    const res = await this.http().get(`/api/runs/${runId}`).set('Authorization', `Bearer ${this.token}`).expect(200);
    return res.body;
  }

  eventsOf(runId: number) {
    return this.events.filter((e) => (e.payload as { runId?: number }).runId === runId || (e.payload as { run?: { id: number } }).run?.id === runId);
  }
}
