import { PlaceholderPage } from '@/components/layout/placeholder-page';

export default function LotsRoute() {
  return <PlaceholderPage title="Lots" purpose="Production lots and the units in each." />;
}
