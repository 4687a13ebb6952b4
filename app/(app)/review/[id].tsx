import { useLocalSearchParams } from 'expo-router';
import { ReviewItemScreen } from '@/components/review/review-item-screen';

export default function ReviewItemRoute() {
  const { id } = useLocalSearchParams<{ id: string }>();
  return <ReviewItemScreen flagId={String(id)} />;
}
