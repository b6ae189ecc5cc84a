import { SimulatorConfigError, validateSimulatorConfig, type SimulatorConfig } from '@railwright/mock-fixture';
import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';

/** The simulator settings file named by FIXTURE_SIM_CONFIG could not be used; the message names file and problem. */
export class SimulatorConfigFileError extends Error {
  constructor(
    readonly path: string,
    readonly problems: string[],
  ) {
    super(`${path}: ${problems.join('; ')}`);
    this.name = 'SimulatorConfigFileError';
  }
}

/**
 * Reads the defect settings of the simulated fixtures (`FIXTURE_SIM_CONFIG`): a JSON file in mock-fixture's
 * `SimulatorConfig` shape (`defectRates`, per-lot `lots.<code>.defectRates`, per-serial `serials`), checked
 * with mock-fixture's own validation so the file means exactly what the simulator makes of it.
 * A relative path is taken from the folder the server starts in.
 * @throws SimulatorConfigFileError naming the file and every problem found (missing, unreadable, not JSON,
 *   or not a valid configuration), so the server can refuse to start with a message a person can act on
 */
export function readSimulatorConfigFile(path: string): SimulatorConfig {
  const file = resolve(path);
  let text: string;
  try {
    text = readFileSync(file, 'utf8');
  } catch (err) {
    const code = (err as NodeJS.ErrnoException).code;
    const why =
      code === 'ENOENT'
        ? 'the file does not exist'
        : code === 'EISDIR'
          ? 'this is a folder, not a file'
          : code === 'EACCES'
            ? 'the server may not read this file'
            : `the file cannot be read (${(err as Error).message})`;
    throw new SimulatorConfigFileError(file, [why]);
  }
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (err) {
    throw new SimulatorConfigFileError(file, [`not valid JSON: ${(err as Error).message}`]);
  }
  try {
    return validateSimulatorConfig(json);
  } catch (err) {
    if (err instanceof SimulatorConfigError) throw new SimulatorConfigFileError(file, err.problems);
    throw err;
  }
}
