import type { ShiftSummaryDto } from './api-schema';

/**
 * A station's counts for the current shift, as `GET /api/stations/:id/shift-summary` and each tile of
 * `GET /api/board` carry them (the server's ShiftSummaryDto); the board and the station screen both show it.
 */
export type ShiftSummary = ShiftSummaryDto;
