import { StyleSheet, View } from 'react-native';
import { useUser } from '@/components/auth/auth-provider';
import { useMailboxQuery } from '@/components/queries/board';
import { formatDayTime } from '@/components/ui/format-time';
import { Card } from '@/components/ui/card';
import { Screen } from '@/components/ui/screen';
import { EmptyState, ErrorState, LoadingState } from '@/components/ui/state-view';
import { Text } from '@/components/ui/text';

/** What the local mail catcher received: escalations, invitations, resets. Nothing here left the machine. */
export function MailboxScreen() {
  const query = useMailboxQuery();
  const user = useUser();
  const timeZone = user.units?.[0]?.timeZone ?? 'UTC';
  if (query.error && !query.data) return <ErrorState error={query.error} onRetry={() => void query.refetch()} />;
  if (!query.data) return <LoadingState label="Opening the mailbox…" />;
  return (
    <Screen title="Mailbox" subtitle="Mail caught by the local SMTP catcher, newest first" refreshing={query.isRefetching} onRefresh={() => void query.refetch()}>
      {query.data.length === 0 ? <EmptyState title="No mail yet" message="Escalations and invitations appear here when they are sent." /> : null}
      {query.data.map((m) => (
        <Card key={m.id} role="article" aria-label={`Mail: ${m.subject}`}>
          <Text variant="bodyStrong">{m.subject}</Text>
          <View style={styles.meta}>
            <Text variant="caption" tone="muted">
              To {m.to} · from {m.from} · {formatDayTime(m.receivedAt, timeZone, user.clock)}
            </Text>
          </View>
          <Text style={styles.body}>{m.text}</Text>
        </Card>
      ))}
    </Screen>
  );
}

const styles = StyleSheet.create({
  meta: { flexDirection: 'row', flexWrap: 'wrap' },
  body: { fontFamily: undefined },
});
