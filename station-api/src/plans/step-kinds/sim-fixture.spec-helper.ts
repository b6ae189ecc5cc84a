import { FixtureSimulator, PRODUCTS, type UnitCondition } from '@railwright/mock-fixture';
import { EventEmitter } from 'node:events';
import type { FixtureTransport, RequestOptions } from '../../fixtures/transport/fixture-transport';
import { ScpiClient } from '../../fixtures/transport/scpi-client';
import type { ProductRatings, StepContext } from './types';

/** The mock-fixture simulator in process, one line at a time, for step tests (instant timing, no serial port). */
class InProcessTransport extends EventEmitter implements FixtureTransport {
  readonly path = 'in-process-simulator';
  readonly isOpen = true;
  readonly generation = 1;
  constructor(private readonly sim: FixtureSimulator) {
    super();
  }
  async open() {}
  async close() {}
  async request(line: string, o: RequestOptions): Promise<string | undefined> {
    const reply = await this.sim.handleLine(line);
    if (!o.expectReply) return undefined;
    if (reply === null) throw new Error(`the simulator gave no reply to ${line}`);
    return reply;
  }
}

/** The ratings a plan is checked against, for a product of the simulator's catalogue. */
export function ratingsOf(partNumber: string): ProductRatings {
  const p = PRODUCTS[partNumber];
  return { partNumber, vinMinV: p.vinMinV, vinNomV: p.vinNomV, vinMaxV: p.vinMaxV, voutNomV: p.voutV, ioutRatedA: p.ioutRatedA };
}

/** A step context on a simulated fixture holding one unit of `partNumber` in the given condition. */
export async function simulatedUnit(partNumber: string, serial: string, condition: UnitCondition): Promise<StepContext> {
  const sim = new FixtureSimulator({ fixtureId: 'FX-SIM', timing: 'instant', config: { defectRates: {}, serials: { [serial]: condition } } });
  const scpi = new ScpiClient(new InProcessTransport(sim), { fixtureCode: 'FX-SIM', timeoutMs: 1000 });
  await scpi.setUnit(serial, partNumber, 'LB-2648-01');
  return { scpi, product: ratingsOf(partNumber), settle: async () => undefined, fixture: {} };
}
