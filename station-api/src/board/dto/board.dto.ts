import { ApiProperty } from '@nestjs/swagger';
import type { RunVerdictName, StationState } from '../../realtime/station-events';
import { ShiftSummaryDto } from '../../shift/dto/shift.dto';

const STATES: StationState[] = ['idle', 'ready', 'testing', 'fault', 'blocked'];
const VERDICTS: RunVerdictName[] = ['running', 'pass', 'fail', 'error', 'aborted'];

export class BoardStationRefDto {
  @ApiProperty() id!: number;
  @ApiProperty() code!: string;
  @ApiProperty() name!: string;
}

export class BoardFixtureDto {
  @ApiProperty() code!: string;
  @ApiProperty({ description: 'ISO 8601' }) calibrationDueAt!: string;
}

export class BoardLotDto {
  @ApiProperty() id!: number;
  @ApiProperty() code!: string;
  @ApiProperty() partNumber!: string;
}

export class BoardCurrentRunDto {
  @ApiProperty() id!: number;
  @ApiProperty() serial!: string;
  @ApiProperty({ description: '0-based index of the step in progress' }) stepIndex!: number;
  @ApiProperty() stepCount!: number;
  @ApiProperty({ type: String, nullable: true }) stepName!: string | null;
  @ApiProperty({ description: 'ISO 8601' }) startedAt!: string;
}

export class BoardLastRunDto {
  @ApiProperty() id!: number;
  @ApiProperty() serial!: string;
  @ApiProperty({ enum: VERDICTS }) verdict!: RunVerdictName;
  @ApiProperty({ type: String, nullable: true }) failedStepKey!: string | null;
  @ApiProperty({ description: 'ISO 8601' }) finishedAt!: string;
}

export class BoardEntryDto {
  @ApiProperty({ type: BoardStationRefDto }) station!: BoardStationRefDto;
  @ApiProperty({ enum: STATES }) state!: StationState;
  @ApiProperty({ type: [String], description: 'why the station is not ready, in plain words' }) reasons!: string[];
  @ApiProperty({ type: [String], description: 'non-blocking warnings (calibration due soon, contacts nearly worn), in plain words' }) warnings!: string[];
  @ApiProperty({ type: BoardFixtureDto, nullable: true }) fixture!: BoardFixtureDto | null;
  @ApiProperty({ type: BoardLotDto, nullable: true }) activeLot!: BoardLotDto | null;
  @ApiProperty({ type: BoardCurrentRunDto, nullable: true }) currentRun!: BoardCurrentRunDto | null;
  @ApiProperty({ type: [BoardLastRunDto], description: "the last 8 runs finished in the shift running now (see shift.shiftStart), newest first, each with finishedAt" })
  lastRuns!: BoardLastRunDto[];
  @ApiProperty({ type: ShiftSummaryDto }) shift!: ShiftSummaryDto;
}
