import { Redirect } from 'expo-router';
import { SignInScreen } from '@/components/screens/sign-in-screen';
import { useAuth } from '@/components/auth/auth-provider';
import { ROLE_HOME } from '@/shared/roles';

export default function SignInRoute() {
  const { user } = useAuth();
  if (user) return <Redirect href={ROLE_HOME[user.role] as '/infants'} />;
  return <SignInScreen />;
}
