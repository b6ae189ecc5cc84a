import { AuditScreen } from '@/features/admin/components/audit-screen';

export default function AdminAuditRoute() {
  return <AuditScreen />;
}
