import { MyInfantsScreen } from '@/components/bedside/my-infants-screen';

export default function MyInfantsRoute() {
  return <MyInfantsScreen />;
}
