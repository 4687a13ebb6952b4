import { router } from 'expo-router';
import { useState } from 'react';
import { Pressable, StyleSheet, View } from 'react-native';
import { toCsv } from '@/shared/csv';
import type { ReviewQueueQuery } from '@/shared/schemas/review';
import { REVIEW_KIND_LABELS, REVIEW_KINDS, type ReviewKind, type ReviewStatus } from '@/shared/vocabulary';
import type { ReviewQueueItem } from '@/shared/types/review';
import { saveTextFile } from '../downloads/save-text-file';
import { useReviewQueueQuery } from '../queries/review';
import { useTheme } from '../theme/theme-provider';
import { Button } from '../ui/button';
import { Card } from '../ui/card';
import { Screen } from '../ui/screen';
import { Segmented } from '../ui/segmented';
import { EmptyState, ErrorState, LoadingState } from '../ui/state-view';
import { StatusBadge } from '../ui/status-badge';
import { Text } from '../ui/text';
import { DateRange, isDate } from './date-range';
import { minutesText, shortDateTime } from './format';

type All = 'all';

/** Flagged gaps, late checks, heat-stress and manual-mode items across the educator's units. */
export function ReviewQueueScreen() {
  const [unitId, setUnitId] = useState<string>('all');
  const [shift, setShift] = useState<'day' | 'night' | All>('all');
  const [kind, setKind] = useState<ReviewKind | All>('all');
  const [status, setStatus] = useState<ReviewStatus>('unreviewed');
  const [nurseId, setNurseId] = useState<string>('all');
  const [range, setRange] = useState({ from: '', to: '' });
  const rangeError = (range.from && !isDate(range.from)) || (range.to && !isDate(range.to)) ? 'Use dates as YYYY-MM-DD.' : undefined;
  const filters: Partial<ReviewQueueQuery> = {
    ...(unitId !== 'all' ? { unitId } : {}),
    ...(shift !== 'all' ? { shift } : {}),
    ...(kind !== 'all' ? { kind } : {}),
    ...(nurseId !== 'all' ? { nurseId } : {}),
    ...(!rangeError && range.from ? { from: range.from } : {}),
    ...(!rangeError && range.to ? { to: range.to } : {}),
    status,
  };
  const query = useReviewQueueQuery(filters);

  const exportCsv = (items: ReviewQueueItem[]) => {
    const csv = toCsv(
      ['flag_id', 'kind', 'unit', 'infant', 'bed', 'raised_at', 'shift', 'shift_date', 'nurse', 'summary', 'minutes_to_first_action', 'minutes_to_resolution', 'teaching_notes'],
      items.map((i) => [i.flagId, i.kind, i.unitName, i.infantName, i.bedLabel, i.raisedAt, i.shift, i.shiftDate, i.nurse?.name ?? null, i.summary, i.minutesToFirstAction, i.minutesToResolution, i.reviewCount]),
    );
    saveTextFile(`review-queue-${new Date().toISOString().slice(0, 10)}.csv`, csv);
  };

  const data = query.data;
  return (
    <Screen
      title="Review queue"
      subtitle="Gap flags, overdue checks, heat-stress prompts and manual-mode warnings"
      actions={data && data.items.length ? <Button label="Export CSV" icon="list" variant="secondary" onPress={() => exportCsv(data.items)} /> : null}
      refreshing={query.isRefetching}
      onRefresh={() => void query.refetch()}
      wide
    >
      <Card>
        {data && data.units.length > 1 ? (
          <Segmented label="Unit" value={unitId} onChange={setUnitId} options={[{ value: 'all', label: 'All units' }, ...data.units.map((u) => ({ value: u.id, label: u.name }))]} />
        ) : null}
        <Segmented label="Shift" value={shift} onChange={setShift} options={[{ value: 'all', label: 'Both shifts' }, { value: 'day', label: 'Day' }, { value: 'night', label: 'Night' }]} />
        <Segmented label="Kind" value={kind} onChange={setKind} options={[{ value: 'all', label: 'All kinds' }, ...REVIEW_KINDS.map((k) => ({ value: k, label: REVIEW_KIND_LABELS[k] }))]} />
        <Segmented label="Review status" value={status} onChange={setStatus} options={[{ value: 'unreviewed', label: 'To review' }, { value: 'reviewed', label: 'Reviewed' }, { value: 'all', label: 'All' }]} />
        {data && data.nurses.length ? (
          <Segmented label="Nurse" value={nurseId} onChange={setNurseId} options={[{ value: 'all', label: 'Any nurse' }, ...data.nurses.map((n) => ({ value: n.id, label: n.name }))]} />
        ) : null}
        <DateRange from={range.from} to={range.to} onChange={setRange} error={rangeError} />
      </Card>
      {query.error ? (
        <ErrorState error={query.error} onRetry={() => void query.refetch()} />
      ) : !data ? (
        <LoadingState label="Loading the review queue…" />
      ) : data.items.length === 0 ? (
        <EmptyState title="Nothing to review" message="No items match these filters." />
      ) : (
        <View style={styles.list} aria-label="Review items">
          <Text tone="muted">{data.total > data.items.length ? `Showing the newest ${data.items.length} of ${data.total} items; narrow the filters to see the rest` : `${data.items.length} items`}</Text>
          {data.items.map((item) => (
            <QueueRow key={item.flagId} item={item} />
          ))}
        </View>
      )}
    </Screen>
  );
}

function QueueRow({ item }: { item: ReviewQueueItem }) {
  const theme = useTheme();
  const tone = item.kind === 'heat-stress' ? 'heat' : item.kind === 'gap' ? 'danger' : 'warning';
  const label = `${REVIEW_KIND_LABELS[item.kind]}, ${item.infantName}, ${shortDateTime(item.raisedAt)}`;
  return (
    <Pressable
      role="link"
      accessibilityLabel={label}
      onPress={() => router.push(`/review/${item.flagId}`)}
      style={({ pressed }) => ({ ...StyleSheet.flatten(styles.row), backgroundColor: theme.colors.surface, borderColor: theme.colors.border, opacity: pressed ? 0.85 : 1 })}
    >
      <View style={styles.rowTop}>
        <StatusBadge tone={tone} icon={item.kind === 'heat-stress' ? 'flame' : item.kind === 'gap' ? 'thermometer' : 'clock'} label={REVIEW_KIND_LABELS[item.kind]} />
        <StatusBadge tone="neutral" icon="clock" label={`${item.shift === 'night' ? 'Night' : 'Day'} shift`} />
        {item.reviewCount ? <StatusBadge tone="ok" icon="check" label="Reviewed" /> : null}
      </View>
      <Text variant="bodyStrong">
        {item.infantName}
        {item.bedLabel ? ` · ${item.bedLabel}` : ''} · {item.unitName}
      </Text>
      <Text>{item.summary}</Text>
      <Text tone="muted" variant="caption">
        Raised {shortDateTime(item.raisedAt)} · {item.nurse ? item.nurse.name : 'nurse unknown'} · first action {minutesText(item.minutesToFirstAction)} · resolved{' '}
        {item.closedAt ? `after ${minutesText(item.minutesToResolution)}` : 'not yet'}
      </Text>
    </Pressable>
  );
}

const styles = StyleSheet.create({
  list: { gap: 8 },
  row: { borderWidth: 1, borderRadius: 12, padding: 12, gap: 6 },
  rowTop: { flexDirection: 'row', gap: 6, flexWrap: 'wrap' },
});
