import { plainToInstance, Type } from 'class-transformer';
import { IsIn, IsInt, IsOptional, IsString, Max, Min, MinLength, validateSync } from 'class-validator';

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

  @IsOptional() @IsIn(['error', 'warn', 'log', 'debug'])
  LOG_LEVEL: 'error' | 'warn' | 'log' | 'debug' = 'log';
}

export function validateEnv(raw: Record<string, unknown>): EnvironmentVariables {
  const env = plainToInstance(EnvironmentVariables, raw, { enableImplicitConversion: false, exposeDefaultValues: true });
  const errors = validateSync(env, { skipMissingProperties: false, whitelist: false });
  if (errors.length > 0) {
    const lines = errors.map((e) => `  ${e.property}: ${Object.values(e.constraints ?? {}).join('; ')}`);
    throw new Error(`Configuration is not valid:\n${lines.join('\n')}`);
  }
  return env;
}

/** Reads and validates process.env once; the only place the environment is read. */
export function loadEnv(): EnvironmentVariables {
  return validateEnv(process.env as Record<string, unknown>);
}
