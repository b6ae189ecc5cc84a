import { plainToInstance, Type } from 'class-transformer';
import { IsIn, IsInt, IsOptional, IsString, Matches, Max, Min, MinLength, validateSync } from 'class-validator';
import { readSimulatorConfigFile } from './fixture-sim.config';

/** Every environment variable the server reads. Documented in .env.example at the repo root. */
export class EnvironmentVariables {
  @IsOptional() @Type(() => Number) @IsInt() @Min(1) @Max(65535)
  PORT: number = 3000;

  @IsOptional() @IsString()
  HOST: string = '0.0.0.0';

  @IsOptional() @IsString()
  DATABASE_PATH: string = './data/railwright.sqlite';

  @IsOptional() @IsString() @MinLength(16, { message: 'JWT_SECRET must be at least 16 characters' })
  JWT_SECRET: string = 'railwright-demo-secret-change-me';

  /** Token lifetime, e.g. 12h (one shift), 30m, 3600 (seconds) */
  @IsOptional() @IsString()
  @Matches(/^\d+(s|m|h|d)?$/, { message: 'JWT_EXPIRES_IN must be a whole number of seconds or a number followed by s, m, h or d (e.g. 12h)' })
  JWT_EXPIRES_IN: string = '12h';

  /** Folder of the built UI to serve; empty to serve none */
  @IsOptional() @IsString()
  UI_DIST: string = '';

  /** Sign-in attempts allowed per minute per client */
  @IsOptional() @Type(() => Number) @IsInt() @Min(1)
  LOGIN_ATTEMPTS_PER_MINUTE: number = 10;

  /** Simulated fixture timing: realistic (seconds per unit) or instant (benchmarks, seeding) */
  @IsOptional() @IsIn(['realistic', 'instant'])
  FIXTURE_SIM_TIMING: 'realistic' | 'instant' = 'realistic';

  /**
   * JSON file of the simulated fixtures' defects (mock-fixture's SimulatorConfig: defectRates, lots,
   * serials); empty: the simulator's demo defect rates. Read and checked at start-up.
   */
  @IsOptional() @IsString()
  FIXTURE_SIM_CONFIG: string = '';

  /** '1' builds test history when seeding (slow: runs the engine); '0' seeds master data and plans only */
  @IsOptional() @IsIn(['0', '1'], { message: "SEED_HISTORY must be '0' or '1'" })
  SEED_HISTORY: '0' | '1' = '1';

  @IsOptional() @IsIn(['error', 'warn', 'log', 'debug'])
  LOG_LEVEL: 'error' | 'warn' | 'log' | 'debug' = 'log';

  /** Shift start times, local server time, HH:MM separated by commas; each shift runs to the next start */
  @IsOptional() @IsString()
  @Matches(/^(?!.*\b(\d\d:\d\d)\b.*\b\1\b)\s*(?:[01]\d|2[0-3]):[0-5]\d(?:\s*,\s*(?:[01]\d|2[0-3]):[0-5]\d)*\s*$/, {
    message: 'SHIFT_STARTS must be times of day written HH:MM (00:00 to 23:59), separated by commas, each listed once (e.g. 06:00,14:00,22:00)',
  })
  SHIFT_STARTS: string = '06:00,14:00,22:00';
}

export function validateEnv(raw: Record<string, unknown>): EnvironmentVariables {
  const env = plainToInstance(EnvironmentVariables, raw, { enableImplicitConversion: false, exposeDefaultValues: true });
  const errors = validateSync(env, { skipMissingProperties: false, whitelist: false });
  const lines = errors.map((e) => `  ${e.property}: ${Object.values(e.constraints ?? {}).join('; ')}`);
  if (env.FIXTURE_SIM_CONFIG && !errors.some((e) => e.property === 'FIXTURE_SIM_CONFIG')) {
    // the file is checked here, so a bad one stops the server (and the seeder) before anything starts
    try {
      readSimulatorConfigFile(env.FIXTURE_SIM_CONFIG);
    } catch (err) {
      lines.push(`  FIXTURE_SIM_CONFIG: ${(err as Error).message}`);
    }
  }
  if (lines.length > 0) throw new Error(`Configuration is not valid:\n${lines.join('\n')}`);
  return env;
}

/** Reads and validates process.env once; the only place the environment is read. */
export function loadEnv(): EnvironmentVariables {
  return validateEnv(process.env as Record<string, unknown>);
}
