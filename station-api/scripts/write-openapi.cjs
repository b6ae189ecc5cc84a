#!/usr/bin/env node
/*
 * Writes the station server's OpenAPI document (the one served at /api/docs/openapi.json) to a file,
 * without a running server: the built app module is created on a throw-away SQLite file, the document is
 * built from the controllers and DTOs, and nothing is listened on, migrated or started.
 *
 *   node station-api/scripts/write-openapi.cjs <out.json>     (needs `npm run build -w station-api` first)
 *
 * Used by station-ui/scripts/api-types.mjs, which turns the document into station-ui/src/lib/api-types.ts.
 */
'use strict';
const { mkdtempSync, rmSync, writeFileSync } = require('node:fs');
const { tmpdir } = require('node:os');
const { join, resolve } = require('node:path');

const out = process.argv[2];
if (!out) {
  console.error('usage: write-openapi.cjs <out.json>');
  process.exit(2);
}

const dist = resolve(__dirname, '..', 'dist');
const dir = mkdtempSync(join(tmpdir(), 'railwright-openapi-'));

async function main() {
  // the modules read the environment as they load: set it before the first require
  Object.assign(process.env, {
    DATABASE_PATH: join(dir, 'openapi.sqlite'),
    FIXTURE_SIM_TIMING: 'instant',
    FIXTURE_SIM_CONFIG: '',
    SEED_HISTORY: '0',
    LOG_LEVEL: 'error',
    UI_DIST: '',
    // only signs nothing here; the settings check wants one of at least 32 bytes
    JWT_SECRET: 'openapi-writer-throwaway-secret-0123456789',
  });
  require('reflect-metadata');
  const { NestFactory } = require('@nestjs/core');
  const { DocumentBuilder, SwaggerModule } = require('@nestjs/swagger');
  const { AppModule } = require(join(dist, 'app.module.js'));
  // create() builds the module graph only; no lifecycle hook runs (no app.init()), so nothing connects
  const app = await NestFactory.create(AppModule, { logger: false, abortOnError: false });
  app.setGlobalPrefix('api');
  // same title and security as src/app.setup.ts; only paths and schemas reach the generated types
  const config = new DocumentBuilder()
    .setTitle('Railwright station API')
    .setDescription('End-of-line functional test of DC-DC power modules')
    .setVersion('0.1.0')
    .addBearerAuth()
    .build();
  const doc = SwaggerModule.createDocument(app, config);
  writeFileSync(out, `${JSON.stringify(doc, null, 2)}\n`);
  await app.close();
}

main()
  .then(() => {
    rmSync(dir, { recursive: true, force: true });
    // a module may leave a timer behind; the document is written, so end here
    process.exit(0);
  })
  .catch((err) => {
    rmSync(dir, { recursive: true, force: true });
    console.error(err instanceof Error ? err.stack : err);
    process.exit(1);
  });
