import 'reflect-metadata';
import { Logger } from '@nestjs/common';
import { NestFactory } from '@nestjs/core';
import { existsSync } from 'node:fs';
import { configureApp } from './app.setup';
import { demoSecret } from './config/demo-secret';
import { EnvironmentVariables, loadEnv, requireJwtSecret } from './config/env.validation';

async function bootstrap(): Promise<void> {
  // a .env file in the working folder, read before the settings are checked (the ConfigModule reads it too,
  // but only once the app module loads, which is after the secret and the database are checked); variables
  // already set in the environment win over the file
  if (existsSync('.env')) process.loadEnvFile('.env');
  let env = loadEnv();
  if (!env.JWT_SECRET && env.RAILWRIGHT_DEMO === '1') {
    // demo only: a random secret kept beside the database, made on first start
    const { secret, file, created } = demoSecret(env.DATABASE_PATH);
    process.env.JWT_SECRET = secret;
    if (created) Logger.log(`Demo mode: a new random token secret was written to ${file}`, 'Bootstrap');
    env = loadEnv();
  }
  requireJwtSecret(env);
  // before the app exists, so every module's start-up hook (crash recovery among them) sees a migrated database
  // imported only now: the ORM config reads the settings as it loads
  const { migrateDatabase } = await import('./config/migrate-on-start');
  const applied = await migrateDatabase(env.DATABASE_PATH);
  if (applied.length > 0) Logger.log(`Applied ${applied.length} database migration(s): ${applied.join(', ')}`, 'Bootstrap');
  // loaded after the check: the module reads the settings as it loads, and a bad one must end in the
  // readable message below, not a stack trace
  const { AppModule } = await import('./app.module');
  const app = await NestFactory.create(AppModule, { logger: levels(env.LOG_LEVEL) });
  configureApp(app, { corsOrigins: env.CORS_ORIGINS });
  await app.listen(env.PORT, env.HOST);
  Logger.log(`Railwright station server listening on ${env.HOST}:${env.PORT}`, 'Bootstrap');
  if (isLoopback(env)) {
    // printed at every level: the one thing someone setting up a station needs to know
    console.log(
      `Only this computer can reach the server (HOST=${env.HOST}). To open it to the plant network, set HOST=0.0.0.0` +
        (env.RAILWRIGHT_DEMO === '1' ? ' and a JWT_SECRET of your own (at least 32 bytes).' : '.'),
    );
  }
}

function isLoopback(env: EnvironmentVariables): boolean {
  return env.HOST === 'localhost' || env.HOST === '::1' || env.HOST.startsWith('127.');
}

function levels(level: string): ('error' | 'warn' | 'log' | 'debug')[] {
  const all = ['error', 'warn', 'log', 'debug'] as const;
  return all.slice(0, all.indexOf(level as (typeof all)[number]) + 1);
}

bootstrap().catch((err) => {
  console.error(err instanceof Error ? err.message : err);
  process.exit(1);
});
