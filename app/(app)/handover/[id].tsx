import { useLocalSearchParams } from 'expo-router';
import { InfantHandoverScreen } from '@/components/handover/handover-screen';

export default function InfantHandoverRoute() {
  const { id } = useLocalSearchParams<{ id: string }>();
  return <InfantHandoverScreen infantId={String(id)} />;
}
