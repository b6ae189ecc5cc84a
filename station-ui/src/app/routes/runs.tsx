import { PlaceholderPage } from '@/components/layout/placeholder-page';

export default function RunsRoute() {
  return <PlaceholderPage title="Runs" purpose="Every test run with its measurements, searchable by serial, lot and verdict." />;
}
