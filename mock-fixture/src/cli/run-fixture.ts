import { readFileSync } from 'node:fs';
import { SerialPort } from 'serialport';
import { SimulatorConfigError, validateSimulatorConfig, type SimulatorConfig } from '../defects';
import { FixtureSimulator } from '../protocol/fixture-simulator';
import { LineSession } from '../protocol/line-session';
import { PRODUCTS } from '../products';

/** Settings of the standalone fixture. */
export interface FixtureCliOptions {
  path: string;
  product: string;
  timing: 'realistic' | 'instant';
  baudRate: number;
  fixtureId: string;
  config?: SimulatorConfig;
  serial?: string;
  lotCode?: string;
}

/** A refusal of the command line, with the usage text to show. */
export class CliUsageError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'CliUsageError';
  }
}

export const CLI_USAGE = `usage: npm run fixture -w mock-fixture -- --path <serial device> --product <part number>
         [--timing realistic|instant] [--config <defects.json>] [--baud 115200]
         [--fixture-id FX-SIM] [--serial <unit serial>] [--lot <lot code>]
products: ${Object.keys(PRODUCTS).join(', ')}`;

/** Baud rates the standalone fixture accepts (the usual UART set). */
const BAUD_RATES = [9600, 19200, 38400, 57600, 115200, 230400, 460800, 921600];

/**
 * Parse the command line (without `node` and the script name).
 * @throws CliUsageError naming the problem
 */
export function parseFixtureArgs(argv: string[], readFile: (path: string) => string = (p) => readFileSync(p, 'utf8')): FixtureCliOptions {
  const values = new Map<string, string>();
  const known = ['--path', '--product', '--timing', '--config', '--baud', '--fixture-id', '--serial', '--lot'];
  for (let i = 0; i < argv.length; i++) {
    const arg = argv[i];
    const [flag, inline] = arg.includes('=') ? [arg.slice(0, arg.indexOf('=')), arg.slice(arg.indexOf('=') + 1)] : [arg, undefined];
    if (flag === '--help' || flag === '-h') throw new CliUsageError('help requested');
    if (!known.includes(flag)) throw new CliUsageError(`unknown option ${JSON.stringify(arg)}`);
    const value = inline ?? argv[++i];
    if (value === undefined || value.startsWith('--')) throw new CliUsageError(`${flag} needs a value`);
    values.set(flag, value);
  }
  const path = values.get('--path');
  if (!path) throw new CliUsageError('--path is required (the serial device to serve, e.g. /dev/pts/3)');
  const product = values.get('--product');
  if (!product) throw new CliUsageError('--product is required');
  if (!PRODUCTS[product]) throw new CliUsageError(`unknown product ${JSON.stringify(product)}; choose one of ${Object.keys(PRODUCTS).join(', ')}`);
  const timing = values.get('--timing') ?? 'realistic';
  if (timing !== 'realistic' && timing !== 'instant') throw new CliUsageError(`--timing must be realistic or instant, got ${JSON.stringify(timing)}`);
  const baudRate = Number(values.get('--baud') ?? '115200');
  if (!BAUD_RATES.includes(baudRate)) throw new CliUsageError(`--baud must be one of ${BAUD_RATES.join(', ')}, got ${values.get('--baud')}`);
  const fixtureId = values.get('--fixture-id') ?? 'FX-SIM';
  let config: SimulatorConfig | undefined;
  const configPath = values.get('--config');
  if (configPath) {
    let text: string;
    try {
      text = readFile(configPath);
    } catch (error) {
      throw new CliUsageError(`cannot read --config ${configPath}: ${error instanceof Error ? error.message : String(error)}`);
    }
    let json: unknown;
    try {
      json = JSON.parse(text);
    } catch (error) {
      throw new CliUsageError(`--config ${configPath} is not valid JSON: ${error instanceof Error ? error.message : String(error)}`);
    }
    try {
      config = validateSimulatorConfig(json);
    } catch (error) {
      if (error instanceof SimulatorConfigError) throw new CliUsageError(`--config ${configPath}: ${error.problems.join('; ')}`);
      throw error;
    }
  }
  return { path, product, timing, baudRate, fixtureId, config, serial: values.get('--serial'), lotCode: values.get('--lot') };
}

/** A running standalone fixture. */
export interface RunningFixture {
  simulator: FixtureSimulator;
  port: SerialPort;
  /** Make the fixture safe and close the port. */
  close(): Promise<void>;
}

/**
 * Open the serial device (8N1) and serve the fixture protocol on it until closed.
 * @param log where status lines go (stderr in the CLI)
 */
export function runFixture(options: FixtureCliOptions, log: (line: string) => void = () => undefined): Promise<RunningFixture> {
  const simulator = new FixtureSimulator({
    fixtureId: options.fixtureId,
    timing: options.timing,
    config: options.config,
    defaultUnit: { partNumber: options.product, serial: options.serial, lotCode: options.lotCode },
  });
  return new Promise((resolve, reject) => {
    const port = new SerialPort({
      path: options.path,
      baudRate: options.baudRate,
      dataBits: 8,
      parity: 'none',
      stopBits: 1,
      autoOpen: false,
    });
    const session = new LineSession(
      simulator,
      (text) =>
        new Promise<void>((done, fail) => {
          port.write(text, (error) => (error ? fail(error) : done()));
        }),
    );
    port.on('data', (chunk: Buffer) => session.feed(chunk));
    port.on('close', () => session.close(`port ${options.path} closed`));
    port.on('error', (error) => {
      session.close(`port ${options.path} error: ${error.message}`);
      log(`port error: ${error.message}; source and load switched off`);
    });
    port.open((error) => {
      if (error) {
        reject(new Error(`cannot open ${options.path}: ${error.message}`));
        return;
      }
      const unit = simulator.state().unit;
      log(
        `fixture ${options.fixtureId} serving ${options.path} at ${options.baudRate} 8N1, ${options.timing} timing, ` +
          `unit ${unit?.serial} (${unit?.partNumber}, ${unit?.condition})`,
      );
      resolve({
        simulator,
        port,
        close: () =>
          new Promise<void>((done) => {
            session.close('fixture shut down');
            if (!port.isOpen) return done();
            port.close(() => done());
          }),
      });
    });
  });
}

/**
 * The `npm run fixture` entry: parse, serve, and on SIGINT/SIGTERM make the fixture safe and exit.
 * @returns the process exit code for a refused command line (2) or a port that would not open (1)
 */
export async function fixtureCliMain(argv: string[]): Promise<number | undefined> {
  const log = (line: string) => process.stderr.write(`${line}\n`);
  let options: FixtureCliOptions;
  try {
    options = parseFixtureArgs(argv);
  } catch (error) {
    if (error instanceof CliUsageError) {
      log(error.message === 'help requested' ? CLI_USAGE : `error: ${error.message}\n${CLI_USAGE}`);
      return error.message === 'help requested' ? 0 : 2;
    }
    throw error;
  }
  let running: RunningFixture;
  try {
    running = await runFixture(options, log);
  } catch (error) {
    log(`error: ${error instanceof Error ? error.message : String(error)}`);
    return 1;
  }
  const stop = (signal: string) => {
    log(`${signal}: switching source and load off and closing ${options.path}`);
    void running.close().then(() => process.exit(0));
  };
  process.once('SIGINT', () => stop('SIGINT'));
  process.once('SIGTERM', () => stop('SIGTERM'));
  running.port.on('close', () => {
    log(`${options.path} closed; exiting`);
    process.exit(0);
  });
  return undefined;
}
