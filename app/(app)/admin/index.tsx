import { AdminHomeScreen } from '@/components/admin/admin-home-screen';

export default function AdminRoute() {
  return <AdminHomeScreen />;
}
