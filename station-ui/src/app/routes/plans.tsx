import { PlaceholderPage } from '@/components/layout/placeholder-page';

export default function PlansRoute() {
  return <PlaceholderPage title="Test plans" purpose="Released plan versions per product: steps, limits and guard bands." />;
}
