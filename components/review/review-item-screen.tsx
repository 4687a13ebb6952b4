import { router } from 'expo-router';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { StyleSheet, View } from 'react-native';
import type { TeachingNoteInput } from '@/shared/schemas/review';
import { REVIEW_KIND_LABELS } from '@/shared/vocabulary';
import type { ReviewItemDetail, ReviewNote } from '@/shared/types/review';
import { problemOf } from '@/components/api/client';
import { useUser } from '@/components/auth/auth-provider';
import { DataTable } from '@/components/reports/data-table';
import { StatusBadge } from '@/components/ui/status-badge';
import { lazyZodResolver } from '@/components/forms/lazy-resolver';
import { FormRootError } from '@/components/forms/form-root-error';
import { reviewPaths, useReviewActionMutation, useReviewItemQuery, useTeachingNoteMutation } from '@/components/queries/review';
import { useTheme } from '@/components/theme/theme-provider';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { Screen } from '@/components/ui/screen';
import { ErrorState, LoadingState } from '@/components/ui/state-view';
import { Text } from '@/components/ui/text';
import { TextField } from '@/components/ui/text-field';
import { minutesText, REVIEW_STATE_WORDS, shortDateTime, temp } from './format';

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
  const user = useUser();
  // Every time in the unit's zone and on the viewer's clock; temperatures in the viewer's unit.
  const when = (iso: string) => shortDateTime(iso, item.timeZone, user.clock);
  const t = (c: number | null) => temp(c, user.tempUnit);
  const current = data.reviews.filter((r) => !r.withdrawn);
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
          Raised {when(item.raisedAt)} · nurse concerned: {item.nurse?.name ?? (item.importedBy ? `none named (imported by ${item.importedBy.name})` : 'unknown')}
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
        <DataTable
          label="Readings around the event"
          header={['Time', 'Probe', 'Remote site', 'Mode', 'Output', 'HR', 'By']}
          highlight={(i) => (data.readings[i]!.raisedFlag ? theme.colors.dangerSoft : undefined)}
          rows={data.readings.map((r) => [
            `${when(r.takenAt)}${r.raisedFlag ? ' ⚑ raised' : ''}${r.replaced ? ' (corrected)' : ''}`,
            t(r.probeCenti),
            `${t(r.remoteCenti)}${r.remoteSite ? ` ${r.remoteSite}` : ''}`,
            r.controlMode ?? '—',
            r.heaterOutputPct === null ? '—' : `${r.heaterOutputPct} %`,
            r.heartRate === null ? '—' : String(r.heartRate),
            r.recordedBy.name,
          ])}
        />
      </Card>

      <Card>
        <Text variant="title" role="heading" aria-level={2}>
          Actions taken
        </Text>
        {data.actions.length === 0 ? <Text tone="muted">No action was charted for this item.</Text> : null}
        {data.actions.map((a) => (
          <Text key={a.id}>
            {when(a.at)} · {a.kind.replace(/-/g, ' ')}
            {a.note ? ` — ${a.note}` : ''} · {a.by.name}
          </Text>
        ))}
      </Card>

      <Card>
        <Text variant="title" role="heading" aria-level={2}>
          Teaching notes
        </Text>
        <View style={styles.state}>
          <StatusBadge
            tone={item.reviewState === 'unreviewed' ? 'warning' : 'ok'}
            icon={item.reviewState === 'unreviewed' ? 'clock' : 'check'}
            label={`Review: ${REVIEW_STATE_WORDS[item.reviewState]}`}
          />
          <Text variant="caption" tone="muted">
            The review status is the educator&apos;s; the flag itself is {item.withdrawn ? 'withdrawn' : item.closedAt ? 'closed' : 'still open'}.
          </Text>
        </View>
        {data.noTeachingPoint ? (
          <Text>
            Closed with no teaching point by {data.noTeachingPoint.by.name}, {when(data.noTeachingPoint.at)}
            {data.noTeachingPoint.comment ? ` — ${data.noTeachingPoint.comment}` : ''}
          </Text>
        ) : null}
        {data.reviews.length === 0 && !data.noTeachingPoint ? <Text tone="muted">Not reviewed yet.</Text> : null}
        {data.reviews.map((r) => (
          <NoteView key={r.id} note={r} when={when} />
        ))}
        {current.length === 0 && !data.noTeachingPoint ? <NoTeachingPointButton flagId={item.flagId} /> : null}
        <TeachingNoteForm flagId={item.flagId} nurseName={item.nurse?.name ?? null} />
      </Card>
    </Screen>
  );
}

/** A note with its versions, whether the nurse read it, and the educator's amend and withdraw. */
function NoteView({ note, when }: { note: ReviewNote; when: (iso: string) => string }) {
  const [editing, setEditing] = useState(false);
  const action = useReviewActionMutation();
  const [error, setError] = useState<string | undefined>();
  const run = async (path: string, body: object) => {
    setError(undefined);
    try {
      await action.mutateAsync({ path, body });
      setEditing(false);
    } catch (err) {
      const problem = problemOf(err);
      setError(problem.kind === 'invalid' ? (problem.fields.note ?? problem.fields.reason ?? problem.message) : problem.message);
    }
  };
  return (
    <View style={styles.note}>
      <Text style={note.withdrawn ? styles.struck : undefined}>{note.note}</Text>
      <Text variant="caption" tone="muted">
        {note.reviewer.name} · {when(note.createdAt)}
        {note.version > 1 ? ` · amended (version ${note.version}, ${when(note.versions[note.version - 1]!.at)})` : ''}
      </Text>
      {note.withdrawn ? (
        <Text variant="caption">
          Withdrawn by {note.withdrawn.by.name}, {when(note.withdrawn.at)}
          {note.withdrawn.reason ? ` — ${note.withdrawn.reason}` : ''}. The nurse no longer sees it.
        </Text>
      ) : note.acknowledged ? (
        <Text variant="caption" tone="ok">
          Read by {note.acknowledged.by.name}, {when(note.acknowledged.at)}
        </Text>
      ) : (
        <Text variant="caption" tone="muted">
          Not yet acknowledged by the nurse.
        </Text>
      )}
      {note.versions.length > 1 ? (
        <Text variant="caption" tone="muted">
          Earlier:{' '}
          {note.versions
            .slice(0, -1)
            .map((v) => `“${v.note}” (${when(v.at)})`)
            .join('; ')}
        </Text>
      ) : null}
      {!note.withdrawn && !editing ? (
        <View style={styles.buttons}>
          <Button label="Amend" icon="review" variant="secondary" compact onPress={() => setEditing(true)} />
          <Button label="Withdraw" icon="out" variant="quiet" compact busy={action.isPending} onPress={() => void run(reviewPaths.withdraw(note.id), {})} />
        </View>
      ) : null}
      {editing ? (
        <AmendForm initial={note.note} busy={action.isPending} onSave={(text) => void run(reviewPaths.amend(note.id), { note: text })} onCancel={() => setEditing(false)} />
      ) : null}
      {error ? (
        <Text variant="caption" tone="danger" role="alert">
          {error}
        </Text>
      ) : null}
    </View>
  );
}

function AmendForm({ initial, busy, onSave, onCancel }: { initial: string; busy: boolean; onSave: (text: string) => void; onCancel: () => void }) {
  const { control, handleSubmit } = useForm<TeachingNoteInput>({ resolver: teachingNoteResolver, defaultValues: { note: initial } });
  return (
    <View style={styles.form}>
      <TextField
        control={control}
        name="note"
        label="Amended note"
        hint="The earlier text stays in the record; the nurse is asked to read the new one."
        multiline
        numberOfLines={4}
        style={styles.multiline}
      />
      <View style={styles.buttons}>
        <Button label="Save the amended note" icon="check" busy={busy} onPress={() => void handleSubmit(({ note }) => onSave(note))()} />
        <Button label="Cancel" icon="back" variant="quiet" onPress={onCancel} />
      </View>
    </View>
  );
}

/** Close the item without writing a note. */
function NoTeachingPointButton({ flagId }: { flagId: string }) {
  const action = useReviewActionMutation();
  const [error, setError] = useState<string | undefined>();
  return (
    <View style={styles.form}>
      <Button
        label="No teaching point: close this item"
        icon="check"
        variant="secondary"
        busy={action.isPending}
        onPress={() => {
          setError(undefined);
          action.mutateAsync({ path: reviewPaths.noTeachingPoint(flagId) }).catch((err: unknown) => setError(problemOf(err).message));
        }}
      />
      {error ? (
        <Text variant="caption" tone="danger" role="alert">
          {error}
        </Text>
      ) : null}
    </View>
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
  note: { gap: 2, paddingVertical: 4 },
  struck: { textDecorationLine: 'line-through' },
  state: { gap: 4 },
  buttons: { flexDirection: 'row', flexWrap: 'wrap', gap: 8 },
  form: { gap: 8, marginTop: 8 },
  multiline: { minHeight: 96, textAlignVertical: 'top', paddingTop: 10 },
});
