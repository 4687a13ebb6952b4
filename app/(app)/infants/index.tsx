import { PlaceholderScreen } from '@/components/screens/placeholder-screen';

export default function MyInfantsRoute() {
  return <PlaceholderScreen title="My infants" subtitle="This shift" body="Your assigned infants appear here." />;
}
