import { PlaceholderPage } from '@/components/layout/placeholder-page';

export default function QualityRoute() {
  return <PlaceholderPage title="Quality" purpose="First-pass yield, failure Pareto, capability and control charts." />;
}
