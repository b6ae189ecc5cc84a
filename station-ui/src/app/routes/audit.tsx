import { AuditScreen } from '@/features/audit/components/audit-screen';

export default function AuditRoute() {
  return <AuditScreen />;
}
