import { EntityManager } from '@mikro-orm/sqlite';
import { Injectable, Logger, OnApplicationBootstrap, OnApplicationShutdown } from '@nestjs/common';
import { REFRESH_EVERY_MS, refreshPlannerStatistics } from './planner-statistics';

/** Keeps the query planner's statistics current: once at start-up (after the migrations), then every 6 h. */
@Injectable()
export class DatabaseMaintenanceService implements OnApplicationBootstrap, OnApplicationShutdown {
  private readonly logger = new Logger(DatabaseMaintenanceService.name);
  private timer?: NodeJS.Timeout;

  constructor(private readonly em: EntityManager) {}

  async onApplicationBootstrap(): Promise<void> {
    await this.refresh('start-up');
    this.timer = setInterval(() => void this.refresh('periodic'), REFRESH_EVERY_MS);
    // never keeps the process alive on its own
    this.timer.unref();
  }

  onApplicationShutdown(): void {
    if (this.timer) clearInterval(this.timer);
  }

  /** Never throws: stale statistics make queries slower, not wrong, so a failure is logged and the server goes on. */
  async refresh(why: string): Promise<void> {
    try {
      const { ms } = await refreshPlannerStatistics(this.em.getConnection());
      this.logger.log(`Planner statistics refreshed (${why}) in ${ms} ms`);
    } catch (err) {
      this.logger.warn(`Planner statistics not refreshed (${why}): ${(err as Error).message}`);
    }
  }
}
