import { PlaceholderScreen } from '@/components/screens/placeholder-screen';

export default function ReportsRoute() {
  return <PlaceholderScreen title="Reports" subtitle="On-time checks and response times" body="Reports appear here." />;
}
