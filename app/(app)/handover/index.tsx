import { MyHandoverScreen } from '@/components/handover/handover-screen';

export default function MyHandoverRoute() {
  return <MyHandoverScreen />;
}
