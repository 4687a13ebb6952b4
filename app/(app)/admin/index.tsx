import { PlaceholderScreen } from '@/components/screens/placeholder-screen';

export default function AdminRoute() {
  return <PlaceholderScreen title="Administration" subtitle="Users, units and beds" body="Administration appears here." />;
}
