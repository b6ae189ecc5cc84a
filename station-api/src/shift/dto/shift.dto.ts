import { ApiProperty } from '@nestjs/swagger';

/** Counters of one station in the current shift; definitions in src/shift/shift.ts (summarizeShift). */
export class ShiftSummaryDto {
  @ApiProperty() stationId!: number;
  @ApiProperty({ example: 'Shift 1 (06:00–14:00)' }) shiftName!: string;
  @ApiProperty({ description: 'inclusive, ISO 8601' }) shiftStart!: string;
  @ApiProperty({ description: 'exclusive, ISO 8601' }) shiftEnd!: string;
  @ApiProperty({ description: 'distinct units with a pass or fail run finished here in the shift' }) tested!: number;
  @ApiProperty({ description: 'of the tested units, those whose latest run in the shift passed' }) passed!: number;
  @ApiProperty({ description: 'of the tested units, those whose latest run in the shift failed' }) failed!: number;
  @ApiProperty({ description: 'runs ended by a fixture or software error (runs, not units)' }) errors!: number;
  @ApiProperty({ description: 'runs aborted (runs, not units)' }) aborted!: number;
  @ApiProperty({
    type: Number,
    nullable: true,
    description: 'units whose first-ever test (attempt 1) passed ÷ units first tested here in this shift, in %; null when none',
  })
  firstPassYieldPct!: number | null;
  @ApiProperty({
    type: Number,
    nullable: true,
    description:
      'units (pass/fail runs) finished in the last 60 minutes once the shift is an hour old; in the first hour, units ÷ hours elapsed from 3 units on; otherwise null (show "—")',
  })
  unitsPerHour!: number | null;
}
