import { PlaceholderPage } from '@/components/layout/placeholder-page';

export default function CharacterizationRoute() {
  return <PlaceholderPage title="Limits from data" purpose="Proposed limits from a pilot build's measurements." />;
}
