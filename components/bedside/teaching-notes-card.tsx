import { StyleSheet, View } from 'react-native';
import { useUser } from '@/components/auth/auth-provider';
import { useMyReviewNotesQuery } from '@/components/queries/review';
import { useAfterFirstPaint } from '@/components/ui/after-next-paint';
import { Card } from '@/components/ui/card';
import { Text } from '@/components/ui/text';
import { formatDayTime } from '@/components/ui/format-time';
import { FLAG_LABELS } from './format';

const SHOWN = 3;

/** The educator's teaching notes on flags this nurse handled: shown to her, newest first. */
export function TeachingNotesCard({ timeZone }: { timeZone: string }) {
  const user = useUser();
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
        <View key={n.id} style={styles.note}>
          <Text variant="label">
            {n.infantName} · {FLAG_LABELS[n.kind as keyof typeof FLAG_LABELS] ?? n.kind} · {formatDayTime(n.raisedAt, timeZone, user.clock)}
          </Text>
          <Text>{n.note}</Text>
          <Text variant="caption" tone="muted">
            {n.reviewer.name}
          </Text>
        </View>
      ))}
    </Card>
  );
}

const styles = StyleSheet.create({
  note: { gap: 2, paddingTop: 8 },
});
