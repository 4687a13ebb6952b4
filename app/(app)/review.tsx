import { PlaceholderScreen } from '@/components/screens/placeholder-screen';

export default function ReviewRoute() {
  return <PlaceholderScreen title="Review queue" subtitle="Flagged gaps and late checks" body="Items to review appear here." />;
}
