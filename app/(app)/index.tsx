import { Redirect } from 'expo-router';
import { ROLE_HOME } from '@/shared/roles';
import { useUser } from '@/components/auth/auth-provider';

/** "/" sends each role to its own home. */
export default function Home() {
  const user = useUser();
  return <Redirect href={ROLE_HOME[user.role] as '/infants'} />;
}
