import { router } from 'expo-router';
import { useState } from 'react';
import { Pressable, StyleSheet, TextInput, View } from 'react-native';
import type { ReviewQueueQuery } from '@/shared/schemas/review';
import { REVIEW_KIND_LABELS, REVIEW_KINDS, type ReviewKind, type ReviewStatus } from '@/shared/vocabulary';
import type { ReviewQueueItem } from '@/shared/types/review';
import { problemOf } from '@/components/api/client';
import { useUser } from '@/components/auth/auth-provider';
import { ExportButtons } from '@/components/reports/export-buttons';
import { useReviewQueueQuery } from '@/components/queries/review';
import { TOUCH_TARGET } from '@/components/theme/theme';
import { useTheme } from '@/components/theme/theme-provider';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { Screen } from '@/components/ui/screen';
import { Segmented } from '@/components/ui/segmented';
import { EmptyState, ErrorState, LoadingState } from '@/components/ui/state-view';
import { StatusBadge } from '@/components/ui/status-badge';
import { Text } from '@/components/ui/text';
import { DateRange, isDate } from './date-range';
import { minutesText, REVIEW_STATE_WORDS, shortDateTime } from './format';

type All = 'all';

/** Flagged gaps, late checks, heat-stress and manual-mode items across the educator's units. */
export function ReviewQueueScreen() {
  const [unitId, setUnitId] = useState<string>('all');
  const [shift, setShift] = useState<'day' | 'night' | All>('all');
  const [kind, setKind] = useState<ReviewKind | All>('all');
  const [status, setStatus] = useState<ReviewStatus>('unreviewed');
  const [nurseId, setNurseId] = useState<string>('all');
  const [range, setRange] = useState({ from: '', to: '' });
  const [search, setSearch] = useState('');
  // Pages after the first, by the cursor each one starts from; any filter change starts again.
  const [more, setMore] = useState<string[]>([]);
  // A bad or reversed range is said under the dates and left out of the request; every other filter stays.
  const rangeError =
    (range.from && !isDate(range.from)) || (range.to && !isDate(range.to))
      ? 'Use dates as YYYY-MM-DD.'
      : range.from && range.to && range.from > range.to
        ? 'The end date must not be before the start date.'
        : undefined;
  const filters: Partial<ReviewQueueQuery> = {
    ...(unitId !== 'all' ? { unitId } : {}),
    ...(shift !== 'all' ? { shift } : {}),
    ...(kind !== 'all' ? { kind } : {}),
    ...(nurseId !== 'all' ? { nurseId } : {}),
    ...(!rangeError && range.from ? { from: range.from } : {}),
    ...(!rangeError && range.to ? { to: range.to } : {}),
    ...(search.trim() ? { q: search.trim() } : {}),
    status,
  };
  const filterKey = JSON.stringify(filters);
  const [shownFor, setShownFor] = useState(filterKey);
  if (shownFor !== filterKey) {
    setShownFor(filterKey);
    setMore([]);
  }
  const query = useReviewQueueQuery({ ...filters, limit: PAGE });

  const data = query.data;
  // A field the server refused (a range among them) is shown beside its filter, not as a broken screen.
  const problem = query.error ? problemOf(query.error) : null;
  const fieldError = problem?.kind === 'invalid' ? (problem.fields.to ?? problem.fields.from) : undefined;
  return (
    <Screen
      title="Review queue"
      subtitle="Gap flags, overdue checks, heat-stress prompts and manual-mode warnings"
      refreshing={query.isRefetching}
      onRefresh={() => void query.refetch()}
      wide
    >
      <Card>
        {data && data.units.length > 1 ? (
          <Segmented
            label="Unit"
            value={unitId}
            onChange={setUnitId}
            options={[{ value: 'all', label: 'All units' }, ...data.units.map((u) => ({ value: u.id, label: u.name }))]}
          />
        ) : null}
        <Segmented
          label="Shift"
          value={shift}
          onChange={setShift}
          options={[
            { value: 'all', label: 'Both shifts' },
            { value: 'day', label: 'Day' },
            { value: 'night', label: 'Night' },
          ]}
        />
        <Segmented
          label="Kind"
          value={kind}
          onChange={setKind}
          options={[{ value: 'all', label: 'All kinds' }, ...REVIEW_KINDS.map((k) => ({ value: k, label: REVIEW_KIND_LABELS[k] }))]}
        />
        <Segmented
          label="Review status"
          value={status}
          onChange={setStatus}
          options={[
            { value: 'unreviewed', label: 'To review' },
            { value: 'reviewed', label: 'Reviewed' },
            { value: 'all', label: 'All' },
          ]}
        />
        {data && data.nurses.length ? (
          <Segmented
            label="Nurse"
            value={nurseId}
            onChange={setNurseId}
            options={[{ value: 'all', label: 'Any nurse' }, ...data.nurses.map((n) => ({ value: n.id, label: n.name }))]}
          />
        ) : null}
        <DateRange from={range.from} to={range.to} onChange={setRange} error={rangeError ?? fieldError} />
        <SearchField value={search} onChange={setSearch} />
      </Card>
      <Card>
        <ExportButtons
          label="Export (every matching item, not only this page)"
          scope={{
            unitId: unitId !== 'all' ? unitId : null,
            from: filters.from,
            to: filters.to,
            flagFilters: { shift: filters.shift, kind: filters.kind, nurseId: filters.nurseId, q: filters.q, status },
          }}
        />
      </Card>
      {query.error && !fieldError ? (
        <ErrorState error={query.error} onRetry={() => void query.refetch()} />
      ) : fieldError ? (
        <EmptyState title="Check the dates" message={fieldError} />
      ) : !data ? (
        <LoadingState label="Loading the review queue…" />
      ) : data.items.length === 0 ? (
        <EmptyState title="Nothing to review" message="No items match these filters." />
      ) : (
        <View style={styles.list} aria-label="Review items">
          <Text tone="muted">{`${data.total} item${data.total === 1 ? '' : 's'}, newest first`}</Text>
          {data.items.map((item) => (
            <QueueRow key={item.flagId} item={item} />
          ))}
          {more.map((cursor) => (
            <QueuePage key={cursor} filters={filters} cursor={cursor} />
          ))}
          <MoreButton next={more.length ? null : data.nextCursor} lastCursor={more[more.length - 1]} filters={filters} onMore={(c) => setMore([...more, c])} />
        </View>
      )}
    </Screen>
  );
}

const PAGE = 50;

/** A later page of the queue, from its cursor. */
function QueuePage({ filters, cursor }: { filters: Partial<ReviewQueueQuery>; cursor: string }) {
  const page = useReviewQueueQuery({ ...filters, cursor, limit: PAGE });
  if (page.error) return <ErrorState error={page.error} onRetry={() => void page.refetch()} />;
  if (!page.data) return <LoadingState label="Loading more items…" />;
  return (
    <>
      {page.data.items.map((item) => (
        <QueueRow key={item.flagId} item={item} />
      ))}
    </>
  );
}

/** "Show more" under the last page loaded: the first page's cursor, or the last loaded page's. */
function MoreButton({ next, lastCursor, filters, onMore }: { next: string | null; lastCursor?: string; filters: Partial<ReviewQueueQuery>; onMore: (cursor: string) => void }) {
  const last = useReviewQueueQuery({ ...filters, cursor: lastCursor, limit: PAGE });
  const cursor = lastCursor ? (last.data?.nextCursor ?? null) : next;
  if (!cursor) return null;
  return <Button label="Show more" icon="list" variant="secondary" onPress={() => onMore(cursor)} />;
}

function SearchField({ value, onChange }: { value: string; onChange: (v: string) => void }) {
  const theme = useTheme();
  return (
    <View style={styles.search}>
      <Text variant="label">Search</Text>
      <TextInput
        accessibilityLabel="Search by infant, bed or hospital number"
        placeholder="Infant, bed or hospital number"
        placeholderTextColor={theme.colors.textMuted}
        value={value}
        onChangeText={onChange}
        style={[styles.input, theme.type.body, { color: theme.colors.text, backgroundColor: theme.colors.surfaceSunken, borderColor: theme.colors.border }]}
      />
    </View>
  );
}

function QueueRow({ item }: { item: ReviewQueueItem }) {
  const theme = useTheme();
  const user = useUser();
  const when = (iso: string) => shortDateTime(iso, item.timeZone, user.clock);
  const tone = item.kind === 'heat-stress' ? 'heat' : item.kind === 'gap' ? 'danger' : 'warning';
  const label = `${REVIEW_KIND_LABELS[item.kind]}, ${item.infantName}, ${when(item.raisedAt)}`;
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
        {item.reviewState !== 'unreviewed' ? <StatusBadge tone="ok" icon="check" label={REVIEW_STATE_WORDS[item.reviewState]} /> : null}
      </View>
      <Text variant="bodyStrong">
        {item.infantName}
        {item.bedLabel ? ` · ${item.bedLabel}` : ''} · {item.unitName}
      </Text>
      <Text style={item.withdrawn ? styles.struck : undefined}>{item.summary}</Text>
      {item.withdrawn ? <Text variant="caption">Withdrawn: the check was on time or the reading was corrected; not a late check.</Text> : null}
      <Text tone="muted" variant="caption">
        Raised {when(item.raisedAt)} · {item.nurse ? item.nurse.name : item.importedBy ? `imported by ${item.importedBy.name}, no nurse named` : 'nurse unknown'} · first action{' '}
        {minutesText(item.minutesToFirstAction)} · resolved {item.closedAt ? `after ${minutesText(item.minutesToResolution)}` : 'not yet'}
      </Text>
    </Pressable>
  );
}

const styles = StyleSheet.create({
  struck: { textDecorationLine: 'line-through' },
  list: { gap: 8 },
  row: { borderWidth: 1, borderRadius: 12, padding: 12, gap: 6 },
  rowTop: { flexDirection: 'row', gap: 6, flexWrap: 'wrap' },
  search: { gap: 4 },
  input: { minHeight: TOUCH_TARGET, borderWidth: 2, borderRadius: 10, paddingHorizontal: 12 },
});
