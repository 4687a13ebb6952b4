import { router } from 'expo-router';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { StyleSheet, View } from 'react-native';
import type { TeachingNoteInput } from '@/shared/schemas/review';
import { REVIEW_KIND_LABELS } from '@/shared/vocabulary';
import type { ReviewItemDetail } from '@/shared/types/review';
import { problemOf } from '../api/client';
import { lazyZodResolver } from '../forms/lazy-resolver';
import { FormRootError } from '../forms/form-root-error';
import { useReviewItemQuery, useTeachingNoteMutation } from '../queries/review';
import { useTheme } from '../theme/theme-provider';
import { Button } from '../ui/button';
import { Card } from '../ui/card';
import { Screen } from '../ui/screen';
import { ErrorState, LoadingState } from '../ui/state-view';
import { Text } from '../ui/text';
import { TextField } from '../ui/text-field';
import { minutesText, shortDateTime, temp } from './format';

const teachingNoteResolver = lazyZodResolver<TeachingNoteInput>((m) => m.teachingNoteSchema);

export function ReviewItemScreen({ flagId }: { flagId: string }) {
  const query = useReviewItemQuery(flagId);
  if (query.error) return <ErrorState error={query.error} onRetry={() => void query.refetch()} />;
  if (!query.data) return <LoadingState label="Loading the item…" />;
  return <ReviewItemView data={query.data} />;
}

function ReviewItemView({ data }: { data: ReviewItemDetail }) {
  const { item } = data;
  const theme = useTheme();
  return (
    <Screen
      title={`${REVIEW_KIND_LABELS[item.kind]}: ${item.infantName}`}
      subtitle={`${item.unitName}${item.bedLabel ? ` · ${item.bedLabel}` : ''} · ${item.shift === 'night' ? 'Night' : 'Day'} shift of ${item.shiftDate}`}
      actions={<Button label="Back to the queue" icon="back" variant="quiet" onPress={() => (router.canGoBack() ? router.back() : router.replace('/review'))} />}
      wide
    >
      <Card>
        <Text variant="title" role="heading" aria-level={2}>
          What happened
        </Text>
        <Text>{item.summary}</Text>
        <Text>
          Raised {shortDateTime(item.raisedAt)} · nurse concerned: {item.nurse?.name ?? (item.importedBy ? `none named (imported by ${item.importedBy.name})` : 'unknown')}
        </Text>
        <Text>
          Time to first action: <Text variant="bodyStrong">{minutesText(item.minutesToFirstAction)}</Text> · time to resolution:{' '}
          <Text variant="bodyStrong">{item.closedAt ? minutesText(item.minutesToResolution) : 'still open'}</Text>
        </Text>
      </Card>

      <Card>
        <Text variant="title" role="heading" aria-level={2}>
          Readings around the event
        </Text>
        <View role="table" aria-label="Readings around the event">
          <View role="row" style={[styles.tr, { borderBottomColor: theme.colors.border }]}>
            {['Time', 'Probe', 'Remote site', 'Mode', 'Output', 'HR', 'By'].map((h) => (
              <Text key={h} role="columnheader" variant="label" style={styles.td}>
                {h}
              </Text>
            ))}
          </View>
          {data.readings.map((r) => (
            <View key={r.id} role="row" style={[styles.tr, { borderBottomColor: theme.colors.border, backgroundColor: r.raisedFlag ? theme.colors.dangerSoft : undefined }]}>
              <Text role="cell" style={styles.td}>
                {shortDateTime(r.takenAt)}
                {r.raisedFlag ? ' ⚑ raised' : ''}
                {r.replaced ? ' (corrected)' : ''}
              </Text>
              <Text role="cell" style={styles.td}>{temp(r.probeCenti)}</Text>
              <Text role="cell" style={styles.td}>
                {temp(r.remoteCenti)}
                {r.remoteSite ? ` ${r.remoteSite}` : ''}
              </Text>
              <Text role="cell" style={styles.td}>{r.controlMode ?? '—'}</Text>
              <Text role="cell" style={styles.td}>{r.heaterOutputPct === null ? '—' : `${r.heaterOutputPct} %`}</Text>
              <Text role="cell" style={styles.td}>{r.heartRate ?? '—'}</Text>
              <Text role="cell" style={styles.td}>{r.recordedBy.name}</Text>
            </View>
          ))}
        </View>
      </Card>

      <Card>
        <Text variant="title" role="heading" aria-level={2}>
          Actions taken
        </Text>
        {data.actions.length === 0 ? <Text tone="muted">No action was charted for this item.</Text> : null}
        {data.actions.map((a) => (
          <Text key={a.id}>
            {shortDateTime(a.at)} · {a.kind.replace(/-/g, ' ')}
            {a.note ? ` — ${a.note}` : ''} · {a.by.name}
          </Text>
        ))}
      </Card>

      <Card>
        <Text variant="title" role="heading" aria-level={2}>
          Teaching notes
        </Text>
        {data.reviews.length === 0 ? <Text tone="muted">Not reviewed yet.</Text> : null}
        {data.reviews.map((r) => (
          <View key={r.id} style={styles.note}>
            <Text>{r.note}</Text>
            <Text variant="caption" tone="muted">
              {r.reviewer.name} · {shortDateTime(r.createdAt)}
            </Text>
          </View>
        ))}
        <TeachingNoteForm flagId={item.flagId} nurseName={item.nurse?.name ?? null} />
      </Card>
    </Screen>
  );
}

function TeachingNoteForm({ flagId, nurseName }: { flagId: string; nurseName: string | null }) {
  const mutation = useTeachingNoteMutation(flagId);
  const [saved, setSaved] = useState(false);
  const [serverError, setServerError] = useState<string | undefined>();
  const { control, handleSubmit, reset, formState } = useForm<TeachingNoteInput>({ resolver: teachingNoteResolver, defaultValues: { note: '' } });
  const onSubmit = handleSubmit(async ({ note }) => {
    setServerError(undefined);
    setSaved(false);
    try {
      await mutation.mutateAsync(note);
      reset({ note: '' });
      setSaved(true);
    } catch (err) {
      const problem = problemOf(err);
      setServerError(problem.kind === 'invalid' ? (problem.fields.note ?? problem.message) : problem.message);
    }
  });
  return (
    <View style={styles.form}>
      <TextField
        control={control}
        name="note"
        label="Teaching note"
        hint={nurseName ? `${nurseName} will see this note.` : 'The nurse concerned will see this note.'}
        multiline
        numberOfLines={4}
        serverError={serverError}
        style={styles.multiline}
      />
      <FormRootError control={control} />
      <Button label="Mark reviewed with this note" icon="check" onPress={() => void onSubmit()} busy={formState.isSubmitting} />
      {saved ? (
        <Text tone="ok" role="status">
          Saved. The item is marked reviewed.
        </Text>
      ) : null}
    </View>
  );
}

const styles = StyleSheet.create({
  tr: { flexDirection: 'row', borderBottomWidth: 1, paddingVertical: 6 },
  td: { flex: 1, minWidth: 70, paddingRight: 6 },
  note: { gap: 2, paddingVertical: 4 },
  form: { gap: 8, marginTop: 8 },
  multiline: { minHeight: 96, textAlignVertical: 'top', paddingTop: 10 },
});
