import '@mantine/charts/styles.css';
import { RepairScreen } from '@/features/repair/components/repair-screen';

/** Repair: the queue, the repair record form and the Pareto by cause (src/features/repair/). */
export default function RepairRoute() {
  return <RepairScreen />;
}
