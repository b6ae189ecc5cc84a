import { PlaceholderPage } from '@/components/layout/placeholder-page';

export default function UnitHistoryRoute() {
  return <PlaceholderPage title="Unit history" purpose="Every run, measurement, repair and disposition of one unit." />;
}
