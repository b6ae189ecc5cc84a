import type { SimulatorConfig } from '@railwright/mock-fixture';
import type { FixtureLinkService } from '../fixtures/transport/fixture-link.service';
import { SerialTransport } from '../fixtures/transport/serial.transport';
import type { FixtureLinkConfig, ProvidedTransport, TransportProvider } from '../fixtures/transport/transport-provider';
import { simulatedBinding, SimulatorHandle, startSimulator, type SimTiming } from './simulated-fixtures';
import { SimulatorTransport } from './simulator.transport';

/** The port-path prefix of simulated fixtures */
export const MOCK_PREFIX = 'mock:';

export interface FixtureSimulationOptions {
  /** Timing of the simulated fixtures: realistic (settling takes real time) or instant (modelled time only) */
  timing: SimTiming;
  /**
   * Where the simulated fixtures put defects (FIXTURE_SIM_CONFIG); every simulated fixture gets it.
   * Without it they use the simulator's demo defect rates.
   */
  config?: SimulatorConfig;
  /**
   * Keeps these simulated fixtures apart from any other in the same process: `mock:FX-101` is served at
   * `mock:FX-101@<namespace>` (the seeder and the benchmark use their own).
   */
  namespace?: string;
  /**
   * Talk to the simulated fixtures in-process ({@link SimulatorTransport}) instead of through the serial
   * stream and the simulated binding. Only for the history seeder, which runs a thousand units.
   */
  inProcess?: boolean;
}

/**
 * The simulated fixtures: registers the transport for `mock:` port paths with the fixture link and keeps a
 * handle on each simulated fixture so tests, the seeder and the benchmark can configure it. Timing is this
 * transport's business: an instant fixture settles in modelled time (`clock.elapse`), a realistic one waits.
 */
export class FixtureSimulation implements TransportProvider {
  readonly prefix = MOCK_PREFIX;
  private readonly handles = new Map<string, { handle: SimulatorHandle; transport: ProvidedTransport['transport'] }>();

  constructor(
    private readonly links: FixtureLinkService,
    private readonly options: FixtureSimulationOptions,
  ) {
    links.registerTransport(this);
  }

  create(fixture: FixtureLinkConfig, options: { lateReplyGraceMs?: number }): ProvidedTransport {
    const path = this.options.namespace ? `${fixture.portPath}@${this.options.namespace}` : fixture.portPath;
    const handle = startSimulator(path, fixture.code, this.options.timing, this.options.config);
    const transport = this.options.inProcess
      ? new SimulatorTransport(path, fixture.code, handle)
      : new SerialTransport({ fixtureCode: fixture.code, path, baudRate: fixture.baudRate, binding: simulatedBinding(), lateReplyGraceMs: options.lateReplyGraceMs });
    this.handles.set(fixture.code, { handle, transport });
    return {
      transport,
      // read at each settle: a test or the seeder may change the timing of a running simulator
      settle: (ms, clock) => (handle.timing === 'instant' ? (clock.elapse(ms), Promise.resolve()) : clock.sleep(ms)),
      release: () => {
        // detaching resets the simulated fixture (source and load off), as a real one does when its link drops
        handle.detach();
        if (this.handles.get(fixture.code)?.handle === handle) this.handles.delete(fixture.code);
      },
      lineRateApplies: false,
    };
  }

  /** The simulated fixture behind a `mock:` fixture, by fixture code. */
  simulator(fixtureCode: string): SimulatorHandle | undefined {
    return this.handles.get(fixtureCode)?.handle;
  }

  /**
   * Gives a simulated fixture a new defect configuration (tests, seeder); `undefined` goes back to this
   * simulation's own (`config`, else the demo rates). Closes the open link first so the next command
   * reaches the new simulator.
   */
  async reconfigure(fixtureCode: string, config: SimulatorConfig | undefined, timing?: SimTiming): Promise<SimulatorHandle> {
    const entry = this.handles.get(fixtureCode);
    if (!entry) throw new Error(`Fixture ${fixtureCode} is not a simulated fixture with an attached simulator`);
    await entry.transport.close();
    entry.handle.reconfigure(config ?? this.options.config, timing);
    return entry.handle;
  }
}
