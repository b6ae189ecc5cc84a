import { plainToInstance, Type } from 'class-transformer';
import {
  IsIn, IsInt, IsOptional, IsString, Matches, Max, Min, Validate, ValidationArguments, ValidatorConstraint, ValidatorConstraintInterface, validateSync,
} from 'class-validator';
import { MAX_TOKEN_LIFETIME_S, tokenLifetimeS } from '../auth/token-lifetime';
import { databasePathProblem } from './database-path';
import { readSimulatorConfigFile } from './fixture-sim.config';

/** 32 bytes = 256 bits, the HMAC-SHA256 output size; RFC 7518 §3.2 requires a key of at least that size for HS256. */
export const JWT_SECRET_MIN_BYTES = 32;

@ValidatorConstraint({ name: 'minBytes' })
class MinBytes implements ValidatorConstraintInterface {
  validate(value: unknown, args: ValidationArguments): boolean {
    return typeof value === 'string' && (value === '' || Buffer.byteLength(value, 'utf8') >= (args.constraints[0] as number));
  }
}

@ValidatorConstraint({ name: 'lifetimeBound' })
class LifetimeBound implements ValidatorConstraintInterface {
  validate(value: unknown): boolean {
    try {
      return typeof value === 'string' && tokenLifetimeS(value) <= MAX_TOKEN_LIFETIME_S;
    } catch {
      return false;
    }
  }
}

/** Every environment variable the server reads. Documented in .env.example at the repo root. */
export class EnvironmentVariables {
  @IsOptional() @Type(() => Number) @IsInt() @Min(1) @Max(65535)
  PORT: number = 3000;

  /** Address to listen on. 127.0.0.1 keeps the server on this computer; 0.0.0.0 opens it to the plant network. */
  @IsOptional() @IsString() @Matches(/^[0-9A-Za-z.:_-]{1,253}$/, { message: 'HOST must be an IP address or host name, e.g. 127.0.0.1 or 0.0.0.0' })
  HOST: string = '127.0.0.1';

  /** '1' under `npm start` / `npm run dev`: a random signing secret is kept in the data folder when JWT_SECRET is not set. */
  @IsOptional() @IsIn(['0', '1', ''], { message: "RAILWRIGHT_DEMO must be '1' (demo) or '0'" })
  RAILWRIGHT_DEMO: '0' | '1' | '' = '';

  /** Origins (scheme://host:port, comma separated) allowed to call the API and open sockets from a browser; empty: same origin only. */
  @IsOptional() @IsString() @Matches(/^\s*$|^\s*https?:\/\/[^\s,]+(\s*,\s*https?:\/\/[^\s,]+)*\s*$/, {
    message: 'CORS_ORIGINS must be origins such as http://10.0.0.5:3000, separated by commas (or empty)',
  })
  CORS_ORIGINS: string = '';

  @IsOptional() @IsString()
  DATABASE_PATH: string = './data/railwright.sqlite';

  /**
   * Signs the sign-in tokens. There is no built-in value: the server refuses to start without one
   * (requireJwtSecret), except in demo mode where main.ts keeps a random one in the data folder.
   */
  @IsOptional() @IsString()
  @Validate(MinBytes, [JWT_SECRET_MIN_BYTES], { message: `JWT_SECRET must be at least ${JWT_SECRET_MIN_BYTES} bytes long (e.g. the output of: openssl rand -hex 32)` })
  JWT_SECRET: string = '';

  /** Token lifetime, e.g. 12h (one shift), 30m, 3600 (seconds) */
  @IsOptional() @IsString()
  @Matches(/^\d{1,9}(s|m|h|d)?$/, { message: 'JWT_EXPIRES_IN must be a whole number of seconds or a number followed by s, m, h or d (e.g. 12h)' })
  @Validate(LifetimeBound, { message: `JWT_EXPIRES_IN must be between 1 second and ${MAX_TOKEN_LIFETIME_S / 86_400} days (7d)` })
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

  /** Days before a fixture's calibration due date from which the fixtures page, the board and the station warn (0: no warning) */
  @IsOptional() @Type(() => Number) @IsInt({ message: 'CALIBRATION_WARN_DAYS must be a whole number of days, e.g. 30' }) @Min(0) @Max(365)
  CALIBRATION_WARN_DAYS: number = 30;
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
  if (!errors.some((e) => e.property === 'DATABASE_PATH')) {
    const problem = databasePathProblem(env.DATABASE_PATH);
    if (problem) lines.push(`  DATABASE_PATH: ${problem}`);
  }
  if (lines.length > 0) throw new Error(`Configuration is not valid:\n${lines.join('\n')}`);
  return env;
}

/** Reads and validates process.env once; the only place the environment is read. */
export function loadEnv(): EnvironmentVariables {
  return validateEnv(process.env as Record<string, unknown>);
}

/**
 * The signing secret, or a one-line refusal. Kept out of validateEnv so the seeder and the migration CLI,
 * which sign nothing, run without it; the server (main.ts) and the auth module call it.
 */
export function requireJwtSecret(env: Pick<EnvironmentVariables, 'JWT_SECRET'>): string {
  if (!env.JWT_SECRET) {
    throw new Error(
      `JWT_SECRET is not set: the server will not sign tokens with a known value. Set JWT_SECRET to at least ${JWT_SECRET_MIN_BYTES} random bytes (openssl rand -hex 32), or start the demo with npm start.`,
    );
  }
  return env.JWT_SECRET;
}
