import 'reflect-metadata';
import { Logger } from '@nestjs/common';
import { NestFactory } from '@nestjs/core';
import { configureApp } from './app.setup';
import { loadEnv } from './config/env.validation';

async function bootstrap(): Promise<void> {
  const env = loadEnv();
  // loaded after the check: the module reads the settings as it loads, and a bad one must end in the
  // readable message below, not a stack trace
  const { AppModule } = await import('./app.module');
  const app = await NestFactory.create(AppModule, { logger: levels(env.LOG_LEVEL) });
  configureApp(app);
  await app.listen(env.PORT, env.HOST);
  Logger.log(`Railwright station server listening on port ${env.PORT}`, 'Bootstrap');
}

function levels(level: string): ('error' | 'warn' | 'log' | 'debug')[] {
  const all = ['error', 'warn', 'log', 'debug'] as const;
  return all.slice(0, all.indexOf(level as (typeof all)[number]) + 1);
}

bootstrap().catch((err) => {
  console.error(err instanceof Error ? err.message : err);
  process.exit(1);
});
