import { useLocalSearchParams } from 'expo-router';
import { CorrectReadingScreen } from '@/components/bedside/correct-reading-screen';

export default function CorrectReadingRoute() {
  const { id, readingId } = useLocalSearchParams<{ id: string; readingId: string }>();
  return <CorrectReadingScreen key={readingId} infantId={id} readingId={readingId} />;
}
