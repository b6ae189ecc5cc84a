export { VerdictBadge, type VerdictBadgeProps, type VerdictBadgeSize } from './verdict-badge';
export { VerdictShape } from './verdict-shape';
