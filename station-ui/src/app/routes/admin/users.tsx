import { UsersScreen } from '@/features/admin/components/users-screen';

export default function AdminUsersRoute() {
  return <UsersScreen />;
}
