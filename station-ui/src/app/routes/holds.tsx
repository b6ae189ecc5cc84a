import { HoldsScreen } from '@/features/holds/components/holds-screen';

/** Holds and alerts: lots on hold, hold rules, alerts and the outbox (src/features/holds/). */
export default function HoldsRoute() {
  return <HoldsScreen />;
}
