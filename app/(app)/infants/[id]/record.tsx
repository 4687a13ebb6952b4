import { useLocalSearchParams } from 'expo-router';
import { RecordReadingScreen } from '@/components/bedside/record-reading-screen';

export default function RecordReadingRoute() {
  const { id } = useLocalSearchParams<{ id: string }>();
  return <RecordReadingScreen key={id} infantId={id} />;
}
