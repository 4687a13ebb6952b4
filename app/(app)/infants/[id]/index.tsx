import { useLocalSearchParams } from 'expo-router';
import { FlowsheetScreen } from '@/components/bedside/flowsheet-screen';

export default function FlowsheetRoute() {
  const { id } = useLocalSearchParams<{ id: string }>();
  return <FlowsheetScreen key={id} infantId={id} />;
}
