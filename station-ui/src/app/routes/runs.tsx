import { RunsScreen } from '@/features/runs/components/runs-screen';

export default function RunsRoute() {
  return <RunsScreen />;
}
