import { LotState } from '../lots/lot.entity';
import type { Station } from './station.entity';

/**
 * What keeps a station from testing, judged from master data alone (no fixture traffic): an empty
 * list means it could test. The run engine adds live state (testing, fault) on top of this.
 */
export function staticBlockReasons(s: Station, now = new Date()): string[] {
  const reasons: string[] = [];
  if (!s.active) reasons.push('Station is out of service.');
  const f = s.fixture;
  if (!f) reasons.push('No fixture is assigned.');
  else {
    if (!f.active) reasons.push(`Fixture ${f.code} is out of service.`);
    if (f.calibrationDueAt.getTime() < now.getTime()) {
      reasons.push(`Fixture ${f.code} calibration expired on ${f.calibrationDueAt.toISOString().slice(0, 10)}.`);
    }
    if (f.contactCyclesUsed >= f.contactCyclesAllowed) {
      reasons.push(`Fixture ${f.code} contacts have reached ${f.contactCyclesAllowed} cycles; replace them.`);
    }
  }
  const lot = s.activeLot;
  if (!lot) reasons.push('No active lot is set.');
  else if (lot.state !== LotState.Open) reasons.push(`Active lot ${lot.code} is ${lot.state.replace('_', ' ')}, not open.`);
  return reasons;
}
