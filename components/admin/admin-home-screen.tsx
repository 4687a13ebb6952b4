import { Link } from 'expo-router';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { Screen } from '@/components/ui/screen';
import { Text } from '@/components/ui/text';

/** The admin's start page; users, units and beds arrive here later. */
export function AdminHomeScreen() {
  return (
    <Screen title="Administration" subtitle="Users, units and beds">
      <Card>
        <Text variant="bodyStrong">Mailbox</Text>
        <Text tone="muted">Every e-mail Warmfold sent through the local mail catcher: escalations to charge nurses, invitations, password resets.</Text>
        <Link href="/admin/mailbox" asChild>
          <Button label="Open the mailbox" icon="bell" variant="secondary" />
        </Link>
      </Card>
    </Screen>
  );
}
