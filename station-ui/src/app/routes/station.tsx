import { StationScreen } from '@/features/station/components/station-screen';

/** The operator station: scan, confirm, test, verdict (src/features/station/). */
export default function StationRoute() {
  return <StationScreen />;
}
