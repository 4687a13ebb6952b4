import { ForgotPasswordScreen } from '@/components/account-links/forgot-password-screen';

export default function ForgotPasswordRoute() {
  return <ForgotPasswordScreen />;
}
