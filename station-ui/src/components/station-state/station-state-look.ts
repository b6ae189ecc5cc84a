import type { StationState } from '@station-events';

export type StationStateShape = 'ring-dot' | 'play' | 'triangle-exclamation' | 'no-entry' | 'ring';

/** How a station state looks: word, shape and colour together, like a verdict, but never a verdict's shape for "ready". */
export interface StationStateLook {
  word: string;
  /** Theme colour name (shade 6 is the base) */
  color: 'signalGreen' | 'copper' | 'signalAmber' | 'signalRed' | 'slate';
  shape: StationStateShape;
  /** Sentence for tooltips and screen readers */
  description: string;
}

/**
 * Station states (docs/architecture.md `station:state`). Ready is not drawn with the PASS check mark, so
 * from across the floor a ready station is never read as a passed unit.
 */
export const stationStateLooks: Record<StationState, StationStateLook> = {
  ready: { word: 'READY', color: 'signalGreen', shape: 'ring-dot', description: 'Ready: scan a unit to test it' },
  testing: { word: 'TESTING', color: 'copper', shape: 'play', description: 'A unit is being tested' },
  fault: { word: 'FAULT', color: 'signalAmber', shape: 'triangle-exclamation', description: 'The fixture is not answering or reported a fault' },
  blocked: { word: 'BLOCKED', color: 'signalRed', shape: 'no-entry', description: 'The station may not test until the reasons shown are cleared' },
  idle: { word: 'IDLE', color: 'slate', shape: 'ring', description: 'No lot or no fixture assigned' },
};

export function isStationState(v: unknown): v is StationState {
  return typeof v === 'string' && Object.hasOwn(stationStateLooks, v);
}
