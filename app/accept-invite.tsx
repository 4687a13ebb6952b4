import { useLocalSearchParams } from 'expo-router';
import { LinkPasswordScreen } from '@/components/account-links/link-password-screen';

export default function AcceptInviteRoute() {
  const { token } = useLocalSearchParams<{ token?: string }>();
  return <LinkPasswordScreen kind="invite" token={typeof token === 'string' ? token : ''} />;
}
