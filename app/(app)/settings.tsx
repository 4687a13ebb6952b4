import { SettingsScreen } from '@/components/screens/settings-screen';

export default function SettingsRoute() {
  return <SettingsScreen />;
}
