export { StationStateMark, StationStateShapeIcon, type StationStateMarkProps } from './station-state-mark';
export { isStationState, stationStateLooks, type StationStateLook, type StationStateShape } from './station-state-look';
