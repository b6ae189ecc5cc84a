import { PlansScreen } from '@/features/plans/components/plans-screen';

export default function PlansRoute() {
  return <PlansScreen />;
}
