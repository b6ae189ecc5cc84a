import { SerialPortMock } from 'serialport';
import type { FixtureSimulator } from './protocol/fixture-simulator';
import { LineSession } from './protocol/line-session';

/*
 * The mock binding must be the one `serialport` itself uses: importing @serialport/binding-mock directly
 * can load a second copy whose port table the stream never sees ("Port does not exist").
 */
const mockBinding = SerialPortMock.binding;

/** The binding-mock interface, as `serialport` exposes it. */
export type SimulatedBindingInterface = typeof mockBinding;
type MockPortBinding = Awaited<ReturnType<SimulatedBindingInterface['open']>>;

const simulators = new Map<string, FixtureSimulator>();
const sessions = new Map<string, LineSession>();

/**
 * A serialport binding whose ports are simulated fixtures. Use it as
 * `new SerialPortStream({ binding: SimulatedFixtureBinding, path: 'mock:FX-101', baudRate: 115200 })`
 * after {@link attachSimulator}. Paths without a simulator behave as plain mock ports.
 */
export const SimulatedFixtureBinding: SimulatedBindingInterface = {
  list: () => mockBinding.list(),
  createPort: (path, options) => mockBinding.createPort(path, options),
  reset: () => {
    for (const [path, session] of sessions) session.close(`binding reset (${path})`);
    sessions.clear();
    simulators.clear();
    mockBinding.reset();
  },
  async open(options) {
    const port = await mockBinding.open(options);
    const simulator = simulators.get(options.path);
    if (simulator) connect(options.path, port, simulator);
    return port;
  },
};

function connect(path: string, port: MockPortBinding, simulator: FixtureSimulator): void {
  const session = new LineSession(simulator, (text) => {
    if (port.isOpen) port.emitData(text);
  });
  sessions.get(path)?.close(`port ${path} reopened`);
  sessions.set(path, session);

  const write = port.write.bind(port);
  port.write = async (buffer: Buffer) => {
    await write(buffer);
    session.feed(buffer);
  };
  const close = port.close.bind(port);
  port.close = async () => {
    // losing the link is a reason to make the fixture safe, whoever closed it
    session.close(`link to ${path} closed`);
    if (sessions.get(path) === session) sessions.delete(path);
    await close();
  };
}

/**
 * Create the mock port `path` and let `simulator` answer whatever is written to it once opened.
 * @throws TypeError for an empty path
 */
export function attachSimulator(path: string, simulator: FixtureSimulator): void {
  if (typeof path !== 'string' || path.length === 0) throw new TypeError('attachSimulator needs a non-empty port path');
  mockBinding.createPort(path, { echo: false, record: false });
  simulators.set(path, simulator);
}

/**
 * Stop simulating `path`: an open link stops being answered and its fixture goes to its safe state. The
 * mock port itself stays (binding-mock cannot delete one) and behaves as a silent port.
 * @returns whether a simulator was attached
 */
export function detachSimulator(path: string): boolean {
  sessions.get(path)?.close(`simulator detached from ${path}`);
  sessions.delete(path);
  return simulators.delete(path);
}

/** The simulator attached to `path`, if any. */
export function simulatorAt(path: string): FixtureSimulator | undefined {
  return simulators.get(path);
}
