import { PlaceholderScreen } from '@/components/screens/placeholder-screen';

export default function BoardRoute() {
  return <PlaceholderScreen title="Unit board" subtitle="Every bed, most urgent first" body="The board appears here." />;
}
