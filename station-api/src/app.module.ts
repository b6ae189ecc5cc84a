import { MikroOrmModule } from '@mikro-orm/nestjs';
import { DynamicModule, Module } from '@nestjs/common';
import { ConfigModule, ConfigService } from '@nestjs/config';
import { ServeStaticModule } from '@nestjs/serve-static';
import { existsSync } from 'node:fs';
import { resolve } from 'node:path';
import { EnvironmentVariables, loadEnv, validateEnv } from './config/env.validation';
import { SqliteDriver } from '@mikro-orm/sqlite';
import { createOrmConfig } from './mikro-orm.config';
import { uiCacheHeaders } from './app.setup';
import { AuditModule } from './audit/audit.module';
import { AuthModule } from './auth/auth.module';
import { FixturesModule } from './fixtures/fixtures.module';
import { LotsModule } from './lots/lots.module';
import { ProductsModule } from './products/products.module';
import { StationsModule } from './stations/stations.module';
import { UnitsModule } from './units/units.module';
import { UsersModule } from './users/users.module';
import { RunsModule } from './runs/runs.module';
import { PlansModule } from './plans/plans.module';
import { BoardModule } from './board/board.module';
import { RepairModule } from './repair/repair.module';
import { ShiftModule } from './shift/shift.module';
import { SimulationModule } from './simulation/simulation.module';
import { YieldModule } from './yield/yield.module';
import { WhatIfModule } from './what-if/what-if.module';
import { DatabaseMaintenanceModule } from './database/maintenance/database-maintenance.module';
import { HoldsModule } from './holds/holds.module';
// H1: limits from characterization data (issue 10)
import { CharacterizationModule } from './characterization/characterization.module';

function staticUi(): DynamicModule[] {
  const dist = loadEnv().UI_DIST;
  if (!dist || !existsSync(dist)) return [];
  // Express 5 syntax: '/api/{*path}' (the old '/api*' turns unknown API routes into 500s)
  return [
    ServeStaticModule.forRoot({
      rootPath: resolve(dist),
      exclude: ['/api/{*path}', '/socket.io/{*path}'],
      // hashed assets cached as immutable, index.html revalidated (issue 11): see uiCacheHeaders
      serveStaticOptions: { setHeaders: uiCacheHeaders(resolve(dist)) },
    }),
  ];
}

@Module({
  imports: [
    ConfigModule.forRoot({ isGlobal: true, ignoreEnvFile: false, validate: validateEnv, cache: true }),
    MikroOrmModule.forRootAsync({
      // named here as well as in the config, so Nest can provide the driver's own EntityManager
      driver: SqliteDriver,
      inject: [ConfigService],
      useFactory: (config: ConfigService<EnvironmentVariables, true>) =>
        createOrmConfig(config.get('DATABASE_PATH', { infer: true })),
    }),
    AuditModule, AuthModule, UsersModule, ProductsModule, FixturesModule, LotsModule, StationsModule, UnitsModule,
    SimulationModule,
    RunsModule,
    PlansModule,
    ShiftModule,
    BoardModule,
    RepairModule,
    YieldModule,
    WhatIfModule,
    DatabaseMaintenanceModule,
    HoldsModule,
    CharacterizationModule, // H1
    ...staticUi(),
  ],
})
export class AppModule {}
