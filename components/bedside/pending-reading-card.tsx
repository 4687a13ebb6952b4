import { useRouter } from 'expo-router';
import { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { useUser } from '@/components/auth/auth-provider';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { StatusBadge } from '@/components/ui/status-badge';
import { Text } from '@/components/ui/text';
import { clockTime } from './format';
import { openRecordForm } from './open-record-form';
import { pendingReadings, usePendingReadings, type PendingReading } from './pending-readings';
import { readingDrafts } from './reading-draft';

/**
 * The infant's readings kept on this device and not yet on the server: those waiting for the
 * connection (sent by themselves), and those the server refused, with its reason, which the nurse
 * opens in the form again to put right, or discards.
 */
export function PendingReadingCards({ infantId, timeZone }: { infantId: string; timeZone: string }) {
  const pending = usePendingReadings(infantId);
  return (
    <>
      {pending.map((p) => (
        <PendingReadingCard key={p.body.id} entry={p} timeZone={timeZone} />
      ))}
    </>
  );
}

function PendingReadingCard({ entry: p, timeZone }: { entry: PendingReading; timeZone: string }) {
  const user = useUser();
  const router = useRouter();
  const [discarding, setDiscarding] = useState(false);
  const mine = p.userId === undefined || p.userId === user.id;
  const canOpen = mine && p.refusal !== undefined && (p.values !== undefined || readingDrafts.get(user.id, p.infantId)?.readingId === p.body.id);

  const open = () => {
    // The refused reading becomes her draft again (same id), unless she has one open already.
    const draft = readingDrafts.get(user.id, p.infantId);
    if (!draft && p.values) readingDrafts.keep({ userId: user.id, infantId: p.infantId, readingId: p.body.id, label: p.label ?? '', values: p.values });
    if (!draft || draft.readingId === p.body.id) pendingReadings.remove(p.body.id);
    openRecordForm(router, p.infantId);
  };
  const discard = () => {
    pendingReadings.remove(p.body.id);
    readingDrafts.removeReading(p.body.id);
  };

  return (
    <Card role="status" style={styles.card}>
      <StatusBadge tone="warning" icon="cloud-off" label={p.refusal ? 'Not saved: refused' : 'Not yet saved'} />
      <Text>
        Probe {p.body.probe ?? '—'} · remote site {p.body.remote ?? '—'} °{p.body.unit} at {clockTime(p.body.takenAt, timeZone, user.clock)}
      </Text>
      <Text variant="caption" tone={p.refusal ? 'danger' : 'muted'}>
        {p.refusal
          ? `The server said: ${p.refusal}`
          : mine
            ? 'Kept on this device; it is sent when the connection returns.'
            : 'Kept on this device for the nurse who saved it; it is sent when she signs in.'}
      </Text>
      {p.refusal && mine ? (
        discarding ? (
          <View style={styles.actions}>
            <Text variant="label">Discard this reading? It will not be charted.</Text>
            <Button label="Keep it" variant="secondary" compact onPress={() => setDiscarding(false)} />
            <Button label="Discard reading" variant="danger" compact onPress={discard} />
          </View>
        ) : (
          <View style={styles.actions}>
            {canOpen ? <Button label="Open in the form" compact onPress={open} /> : null}
            <Button label="Discard" variant="quiet" compact onPress={() => setDiscarding(true)} />
          </View>
        )
      ) : null}
    </Card>
  );
}

const styles = StyleSheet.create({
  card: { gap: 6 },
  actions: { flexDirection: 'row', flexWrap: 'wrap', alignItems: 'center', gap: 8 },
});
