import { Module } from '@nestjs/common';
import { ConfigService } from '@nestjs/config';
import type { EnvironmentVariables } from '../config/env.validation';
import { FixtureLinkModule } from '../fixtures/transport/fixture-link.module';
import { FixtureLinkService } from '../fixtures/transport/fixture-link.service';
import { FixtureSimulation } from './fixture-simulation';
import { readSimulatorConfigFile } from './simulator-config-file';

/**
 * The simulated fixtures of the server: serves `mock:` port paths for the fixture link, with the timing
 * (FIXTURE_SIM_TIMING) and defects (FIXTURE_SIM_CONFIG) of the environment. The provider registers itself
 * when it is built, which Nest does before any start-up hook prepares the fixtures.
 */
@Module({
  imports: [FixtureLinkModule],
  providers: [
    {
      provide: FixtureSimulation,
      inject: [FixtureLinkService, ConfigService],
      useFactory: (links: FixtureLinkService, config: ConfigService<EnvironmentVariables, true>) => {
        // checked when the environment was validated; read again here for the settings themselves
        const simConfigPath = config.get('FIXTURE_SIM_CONFIG', { infer: true });
        return new FixtureSimulation(links, {
          timing: config.get('FIXTURE_SIM_TIMING', { infer: true }),
          ...(simConfigPath ? { config: readSimulatorConfigFile(simConfigPath) } : {}),
        });
      },
    },
  ],
  exports: [FixtureSimulation],
})
export class SimulationModule {}
