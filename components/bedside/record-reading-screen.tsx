import { useRouter } from 'expo-router';
import { useCallback, useEffect, useRef, useState, useSyncExternalStore } from 'react';
import { StyleSheet, View } from 'react-native';
import { fromCentiCelsius } from '@/shared/thermal/units';
import { problemOf } from '@/components/api/client';
import { onSignedInAgain, useUser } from '@/components/auth/auth-provider';
import { useCreateReadingMutation, useFlowsheetQuery, useInfantQuery } from '@/components/queries/infants';
import { useQueryClient } from '@tanstack/react-query';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { useTheme } from '@/components/theme/theme-provider';
import { Screen } from '@/components/ui/screen';
import { ErrorState, LoadingState } from '@/components/ui/state-view';
import { Text } from '@/components/ui/text';
import { formatClock, formatDayTime } from '@/components/ui/format-time';
import { pendingReadings, startPendingFlush, type PendingReading } from './pending-readings';
import { readingDrafts, type ReadingDraft } from './reading-draft';
import { ReadingForm } from './reading-form';
import type { ReadingFormValues } from './reading-form-values';

const newId = () => globalThis.crypto.randomUUID();

/**
 * The record form of one infant. What the nurse types is kept as her draft on this device (per
 * infant and per user) and comes back after a reload, going back or another tab, or a new sign-in
 * of hers; it goes when the reading is saved or she discards it. A save the server answers with
 * an ended session waits under the sign-in shown over the form and goes again, with the same id,
 * once she has signed in; a reading the server refuses stays pending with its reason.
 */
export function RecordReadingScreen({ infantId }: { infantId: string }) {
  // Another user signing in over an ended session gets a form of their own, never the first one's.
  const user = useUser();
  return <RecordReading key={user.id} infantId={infantId} />;
}

function RecordReading({ infantId }: { infantId: string }) {
  const user = useUser();
  const theme = useTheme();
  const router = useRouter();
  const queryClient = useQueryClient();
  const infant = useInfantQuery(infantId);
  const sheet = useFlowsheetQuery(infantId, 12);
  const mutation = useCreateReadingMutation(infantId);
  const [fields, setFields] = useState<Record<string, string>>({});
  useEffect(() => startPendingFlush(queryClient), [queryClient]);

  // The draft found when the form opened (only this user's), and the reading id it carries.
  const [restored, setRestored] = useState<ReadingDraft | null>(() => readingDrafts.get(user.id, infantId));
  const [readingId, setReadingId] = useState(() => restored?.readingId ?? newId());
  const [formKey, setFormKey] = useState(0);
  const values = useRef<Partial<ReadingFormValues> | null>(restored?.values ?? null);
  const hasDraft = useSyncExternalStore(
    readingDrafts.subscribe,
    () => readingDrafts.get(user.id, infantId) !== null,
    () => false,
  );
  // A save that met an ended session, with the user it belongs to.
  const [held, setHeld] = useState<{ userId: string; body: PendingReading['body'] } | null>(null);

  const d = infant.data;
  const label = d ? [d.infant.bedLabel, d.infant.displayName].filter(Boolean).join(' ') : '';

  const keep = useCallback(
    (next: ReadingFormValues) => {
      values.current = next;
      readingDrafts.keep({ userId: user.id, infantId, readingId, label, values: next });
    },
    [user.id, infantId, readingId, label],
  );

  const discard = () => {
    readingDrafts.remove(user.id, infantId);
    // A refused copy of the same reading goes with it: she chose not to chart it.
    pendingReadings.remove(readingId);
    values.current = null;
    setRestored(null);
    setReadingId(newId());
    setFormKey((k) => k + 1);
    setFields({});
    setHeld(null);
    mutation.reset();
  };

  const save = (body: PendingReading['body']) =>
    mutation.mutate(body, {
      onSuccess: (outcome) => {
        // Saved, or kept as pending by the offline queue: either way no longer a draft.
        readingDrafts.removeReading(body.id);
        if (!outcome.saved) pendingReadings.describe(body.id, { label, values: values.current ?? undefined });
        setFields({});
        router.replace(`/infants/${infantId}`);
      },
      onError: (err) => {
        const p = problemOf(err);
        if (p.kind === 'unauthorized') {
          setHeld({ userId: user.id, body });
          return;
        }
        pendingReadings.describe(body.id, { label, values: values.current ?? undefined });
        setFields('fields' in p && p.fields ? p.fields : {});
      },
    });
  const saveLatest = useRef(save);
  useEffect(() => {
    saveLatest.current = save;
  });
  const heldNow = useRef(held);
  useEffect(() => {
    heldNow.current = held;
  }, [held]);

  // Signed in again: the same nurse's held save goes, with the same id (stored once); anyone
  // else's session drops it, and it stays as the first nurse's draft.
  useEffect(
    () =>
      onSignedInAgain((userId) => {
        const waiting = heldNow.current;
        if (!waiting) return;
        setHeld(null);
        heldNow.current = null;
        if (waiting.userId === userId) saveLatest.current(waiting.body);
      }),
    [],
  );

  if (infant.isError && !infant.data) return <ErrorState error={infant.error} onRetry={() => void infant.refetch()} />;
  if (!d) return <LoadingState label="Opening the record form…" />;
  const problem = mutation.isError ? problemOf(mutation.error) : null;
  const shownProblem = problem && problem.kind !== 'unauthorized' ? problem : null;
  const title = `Record: ${d.infant.bedLabel ?? ''} ${d.infant.displayName}`;
  return (
    <ReadingForm
      key={formKey}
      unit={user.tempUnit}
      timeZone={d.timeZone}
      gapLimitCenti={sheet.data?.policy.gapLimitCenti ?? 50}
      defaults={{
        controlMode: d.defaults.controlMode,
        set: d.defaults.setCenti === null ? '' : fromCentiCelsius(d.defaults.setCenti, user.tempUnit).toFixed(1),
        remoteSite: d.defaults.remoteSite,
        placement: d.defaults.placement ?? null,
      }}
      makeId={() => readingId}
      initialValues={restored?.values}
      onValuesChange={keep}
      busy={mutation.isPending || held !== null}
      serverFields={fields}
      serverMessage={shownProblem?.message}
      onCancel={() => router.back()}
      onSubmit={save}
      // The fields scroll; Save's footer sits below the scrolling area, so it stays on screen
      // whatever is filled and never covers a field (a sticky footer over the page hid the ones
      // behind it).
      frame={(form, footer) => (
        <View style={styles.frame}>
          <Screen title={title} subtitle={`Temperatures in °${user.tempUnit}`}>
            {restored ? (
              <Card role="status" style={styles.draft}>
                <Text variant="bodyStrong">{`Draft kept from ${draftTime(restored.updatedAt, d.timeZone, user.clock)}`}</Text>
                <Text variant="caption" tone="muted">
                  Your values as you left them. Check them, then save, or discard the draft.
                </Text>
                <View style={styles.draftActions}>
                  <Button label="Discard draft" variant="secondary" compact onPress={discard} />
                </View>
              </Card>
            ) : null}
            {form}
            {held ? (
              <Text role="status" tone="warning" style={styles.below}>
                Not saved yet: sign in again and it is sent.
              </Text>
            ) : null}
            {/* Below the form, so the fields never move while she types the first value. */}
            {!restored && hasDraft ? (
              <View style={[styles.draftActions, styles.below]}>
                <Text variant="caption" tone="muted" role="status">
                  Kept on this device as a draft until you save.
                </Text>
                <Button label="Discard draft" variant="quiet" compact onPress={discard} />
              </View>
            ) : null}
          </Screen>
          <View style={[styles.footerBar, { backgroundColor: theme.colors.background, borderTopColor: theme.colors.border }]}>
            <View style={styles.footerColumn}>{footer}</View>
          </View>
        </View>
      )}
    />
  );
}

/** "03:12", or with the day when the draft is from another day. */
function draftTime(iso: string, timeZone: string, clock: '24h' | '12h'): string {
  const today = formatDayTime(new Date(), timeZone, clock).split(',')[0];
  const day = formatDayTime(iso, timeZone, clock);
  return day.split(',')[0] === today ? formatClock(iso, timeZone, clock) : day;
}

const styles = StyleSheet.create({
  frame: { flex: 1 },
  // Lined up with the Screen's column (960 px at most, 16 px in from its sides).
  footerBar: { borderTopWidth: StyleSheet.hairlineWidth, paddingVertical: 10 },
  footerColumn: { width: '100%', maxWidth: 960, alignSelf: 'center', paddingHorizontal: 16 },
  draft: { gap: 6, marginBottom: 12 },
  draftActions: { flexDirection: 'row', flexWrap: 'wrap', alignItems: 'center', gap: 8 },
  below: { marginTop: 12 },
});
