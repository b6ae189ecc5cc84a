import { PlaceholderPage } from '@/components/layout/placeholder-page';

export default function FixturesRoute() {
  return <PlaceholderPage title="Fixtures" purpose="Test fixtures, their connection and calibration status." />;
}
