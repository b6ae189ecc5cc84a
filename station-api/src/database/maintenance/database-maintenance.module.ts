import { Module } from '@nestjs/common';
import { DatabaseMaintenanceService } from './database-maintenance.service';

/** Database upkeep that runs inside the server (planner statistics). */
@Module({ providers: [DatabaseMaintenanceService], exports: [DatabaseMaintenanceService] })
export class DatabaseMaintenanceModule {}
