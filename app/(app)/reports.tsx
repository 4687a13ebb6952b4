import { ReportsScreen } from '@/components/reports/reports-screen';

export default function ReportsRoute() {
  return <ReportsScreen />;
}
