import { FixturesScreen } from '@/features/fixtures/components/fixtures-screen';

export default function FixturesRoute() {
  return <FixturesScreen />;
}
