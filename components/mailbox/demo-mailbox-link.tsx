import { useRouter } from 'expo-router';
import { useDemoModeQuery } from '@/components/queries/mailbox';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { Text } from '@/components/ui/text';

/** A card that opens the demo's mailbox; nothing at all on a production server. */
export function DemoMailboxLink() {
  const demo = useDemoModeQuery();
  const router = useRouter();
  if (demo.data !== true) return null;
  return (
    <Card>
      <Text variant="bodyStrong">Mailbox (demo)</Text>
      <Text tone="muted">The demo keeps its e-mail here instead of sending it: mail addressed to you, and the invitations you sent (their links are for the invitee only).</Text>
      <Button label="Open my mailbox" icon="bell" variant="secondary" onPress={() => router.push('/mailbox')} />
    </Card>
  );
}
