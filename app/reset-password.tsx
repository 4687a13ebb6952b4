import { useLocalSearchParams } from 'expo-router';
import { LinkPasswordScreen } from '@/components/account-links/link-password-screen';

export default function ResetPasswordRoute() {
  const { token } = useLocalSearchParams<{ token?: string }>();
  return <LinkPasswordScreen kind="reset" token={typeof token === 'string' ? token : ''} />;
}
