import { StyleSheet, View } from 'react-native';
import { useUser } from '@/components/auth/auth-provider';
import { useState } from 'react';
import { problemOf } from '@/components/api/client';
import { reviewPaths, useMyReviewNotesQuery, useReviewActionMutation } from '@/components/queries/review';
import { Button } from '@/components/ui/button';
import type { MyReviewNote } from '@/shared/types/review';
import { useAfterFirstPaint } from '@/components/ui/after-next-paint';
import { Card } from '@/components/ui/card';
import { Text } from '@/components/ui/text';
import { formatDayTime } from '@/components/ui/format-time';
import { FLAG_LABELS } from './format';

const SHOWN = 3;

/** The educator's teaching notes on flags this nurse handled: shown to her, newest first. */
export function TeachingNotesCard({ timeZone }: { timeZone: string }) {
  // Asked for once My infants is on screen: the notes sit below the list and can wait a frame.
  const query = useMyReviewNotesQuery({ enabled: useAfterFirstPaint() });
  const notes = query.data?.notes ?? [];
  if (notes.length === 0) return null;
  const newest = [...notes].sort((a, b) => b.createdAt.localeCompare(a.createdAt)).slice(0, SHOWN);
  return (
    <Card>
      <Text variant="title" role="heading" aria-level={2}>
        Notes from your educator
      </Text>
      {newest.map((n) => (
        <NoteRow key={n.id} note={n} timeZone={timeZone} />
      ))}
    </Card>
  );
}

/** One note; the nurse says she read it (the educator sees when). */
function NoteRow({ note: n, timeZone }: { note: MyReviewNote; timeZone: string }) {
  const user = useUser();
  const action = useReviewActionMutation();
  const [error, setError] = useState<string | undefined>();
  return (
    <View style={styles.note}>
      <Text variant="label">
        {n.infantName} · {FLAG_LABELS[n.kind as keyof typeof FLAG_LABELS] ?? n.kind} · {formatDayTime(n.raisedAt, timeZone, user.clock)}
      </Text>
      <Text>{n.note}</Text>
      <Text variant="caption" tone="muted">
        {n.reviewer.name}
        {n.version > 1 ? ' · amended' : ''}
      </Text>
      {n.acknowledged ? (
        <Text variant="caption" tone="ok">
          You marked this read, {formatDayTime(n.acknowledged.at, timeZone, user.clock)}
        </Text>
      ) : (
        <Button
          label="Mark as read"
          icon="check"
          variant="secondary"
          compact
          busy={action.isPending}
          onPress={() => {
            setError(undefined);
            action.mutateAsync({ path: reviewPaths.acknowledge(n.id) }).catch((err: unknown) => setError(problemOf(err).message));
          }}
        />
      )}
      {error ? (
        <Text variant="caption" tone="danger" role="alert">
          {error}
        </Text>
      ) : null}
    </View>
  );
}

const styles = StyleSheet.create({
  note: { gap: 2, paddingTop: 8 },
});
