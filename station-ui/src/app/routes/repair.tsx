import { RepairScreen } from '@/features/repair/components/repair-screen';

/** Repair: the queue of failed units and the repair steps on them (src/features/repair/). */
export default function RepairRoute() {
  return <RepairScreen />;
}
