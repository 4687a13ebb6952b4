import { StyleSheet, View } from 'react-native';
import { problemOf } from '@/components/api/client';
import { useUser } from '@/components/auth/auth-provider';
import { useMailboxQuery } from '@/components/queries/mailbox';
import { formatDayTime } from '@/components/ui/format-time';
import { Card } from '@/components/ui/card';
import { Screen } from '@/components/ui/screen';
import { EmptyState, ErrorState, LoadingState } from '@/components/ui/state-view';
import { Text } from '@/components/ui/text';

/**
 * The demo's mailbox: what the local mail catcher kept for the signed-in person (escalations,
 * their own reset link, the invitations they sent, whose links only the invitee can open).
 * Nothing here left the machine; a production server has no mailbox.
 */
export function MailboxScreen() {
  const query = useMailboxQuery();
  const user = useUser();
  const timeZone = user.units?.[0]?.timeZone ?? 'UTC';
  if (query.error && !query.data) {
    if (problemOf(query.error).kind === 'not-found') {
      return (
        <Screen title="Mailbox">
          <EmptyState title="No mailbox here" message="Only the demo keeps mail in Warmfold. On this server, e-mail goes to each person's work address." />
        </Screen>
      );
    }
    return <ErrorState error={query.error} onRetry={() => void query.refetch()} />;
  }
  if (!query.data) return <LoadingState label="Opening the mailbox…" />;
  return (
    <Screen title="Mailbox" subtitle="The demo's mail to you, and the invitations you sent, newest first" refreshing={query.isRefetching} onRefresh={() => void query.refetch()}>
      {query.data.length === 0 ? <EmptyState title="No mail yet" message="Escalations, reset links and invitations you send appear here." /> : null}
      {query.data.map((m) => (
        <Card key={m.id} role="article" aria-label={`Mail: ${m.subject}`}>
          <Text variant="bodyStrong">{m.subject}</Text>
          <View style={styles.meta}>
            <Text variant="caption" tone="muted">
              To {m.to} · from {m.from} · {formatDayTime(m.receivedAt, timeZone, user.clock)}
            </Text>
          </View>
          <Text>{m.text}</Text>
        </Card>
      ))}
    </Screen>
  );
}

const styles = StyleSheet.create({
  meta: { flexDirection: 'row', flexWrap: 'wrap' },
});
