import { PlaceholderPage } from '@/components/layout/placeholder-page';

export default function HoldsRoute() {
  return <PlaceholderPage title="Holds and alerts" purpose="Hold rules, lots on hold and the e-mail outbox." />;
}
