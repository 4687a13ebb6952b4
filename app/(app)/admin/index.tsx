import { AdminHomeScreen } from '@/components/admin-users/admin-home-screen';

export default function AdminRoute() {
  return <AdminHomeScreen />;
}
