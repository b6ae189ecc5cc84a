import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import { AuditEventDto } from '../../audit/dto/audit.dto';

export class HistoryMeasurementDto {
  @ApiProperty() id!: number;
  @ApiProperty() stepIndex!: number;
  @ApiProperty() stepKey!: string;
  @ApiProperty() stepName!: string;
  @ApiProperty() quantity!: string;
  @ApiProperty() name!: string;
  @ApiProperty({ type: Number, nullable: true }) value!: number | null;
  @ApiProperty() unit!: string;
  @ApiProperty({ type: Number, nullable: true }) lowLimit!: number | null;
  @ApiProperty({ type: Number, nullable: true }) highLimit!: number | null;
  @ApiProperty({ type: Number, nullable: true, description: 'acceptance limit after the guard band' }) guardedLow!: number | null;
  @ApiProperty({ type: Number, nullable: true }) guardedHigh!: number | null;
  @ApiProperty({ description: 'expanded uncertainty U (k = 2) in the unit' }) uncertainty!: number;
  @ApiProperty({ example: 'guarded' }) rule!: string;
  @ApiProperty({ example: 'pass' }) verdict!: string;
  @ApiProperty({ type: String, nullable: true, description: 'pass, conditional_pass, conditional_fail or fail (ILAC-G8)' }) decision!: string | null;
  @ApiProperty({ description: 'ISO 8601' }) measuredAt!: string;
}

export class HistoryRunDto {
  @ApiProperty() id!: number;
  @ApiProperty() attempt!: number;
  @ApiProperty({ example: 'pass', description: 'running, pass, fail, error, aborted (shown as "Stopped")' }) verdict!: string;
  @ApiProperty({ type: String, nullable: true }) endReason!: string | null;
  @ApiProperty({ type: String, nullable: true }) errorMessage!: string | null;
  @ApiProperty({ type: String, nullable: true }) failedStepKey!: string | null;
  @ApiProperty() startedAt!: string;
  @ApiProperty({ type: String, nullable: true }) finishedAt!: string | null;
  @ApiProperty() plan!: { versionId: number; planId: number; code: string; version: number; checksum: string };
  @ApiProperty() station!: { id: number; code: string; name: string };
  @ApiProperty({ description: 'the fixture and its calibration: as recorded by the run (dueAtRun), and its current record' })
  fixture!: {
    id: number;
    code: string;
    identity: string | null;
    calibrationDueAtRun: string | null;
    calibrationId: number | null;
    calibratedAt: string | null;
    calibrationDueAt: string | null;
    certificate: string | null;
  };
  @ApiProperty() operator!: { username: string | null; displayName: string };
  @ApiProperty({ type: String, nullable: true }) overrideReason!: string | null;
  @ApiProperty({ type: [HistoryMeasurementDto] }) measurements!: HistoryMeasurementDto[];
}

export class UnitHistoryUnitDto {
  @ApiProperty() id!: number;
  @ApiProperty() serial!: string;
  @ApiProperty({ example: 'in_repair' }) state!: string;
  @ApiProperty({ example: 'In repair', description: 'state in words' }) stateWords!: string;
  @ApiProperty({ description: 'where the unit stands now, in words (its disposition)' }) disposition!: string;
  @ApiProperty() testCount!: number;
  @ApiProperty({ type: String, nullable: true }) sentToRepairAt!: string | null;
  @ApiProperty() product!: { id: number; partNumber: string; name: string };
  @ApiProperty() lot!: { id: number; code: string; state: string };
}

export class UnitHistoryDto {
  @ApiProperty({ type: UnitHistoryUnitDto }) unit!: UnitHistoryUnitDto;
  @ApiProperty({ type: [HistoryRunDto], description: 'newest first' }) runs!: HistoryRunDto[];
  @ApiProperty({ type: [AuditEventDto], description: 'repair steps, dispositions and run overrides, newest first, in words' }) events!: AuditEventDto[];
  @ApiPropertyOptional({ description: 'repair record fields per event id (symptom, cause, action, ...) in words' })
  repairRecords!: Record<string, { field: string; value: string }[]>;
}
