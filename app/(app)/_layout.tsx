import { Redirect, Slot } from 'expo-router';
import { useAuth } from '@/components/auth/auth-provider';
import { SessionSheet } from '@/components/auth/session-sheet';
import { PendingSender } from '@/components/offline/pending-sender';
import { AppShell } from '@/components/shell/app-shell';
import { LoadingState } from '@/components/ui/state-view';

/** Everything in this group needs a signed-in user; an ended session is signed into again over the screen. */
export default function SignedInLayout() {
  const { user, ready } = useAuth();
  if (!user && !ready) return <LoadingState label="Opening Warmfold…" />;
  if (!user) return <Redirect href="/sign-in" />;
  return (
    <AppShell>
      <Slot />
      <SessionSheet />
      {/* Readings kept on the phone go out when the connection returns, from any screen. */}
      <PendingSender />
    </AppShell>
  );
}
