import { useEffect, useMemo, useState } from 'react';
import { useForm, useWatch } from 'react-hook-form';
import { StyleSheet, View } from 'react-native';
import { problemOf } from '@/components/api/client';
import { lazyZodResolver } from '@/components/forms/lazy-resolver';
import { FormRootError } from '@/components/forms/form-root-error';
import { useUser } from '@/components/auth/auth-provider';
import { ConfirmDialog, type PendingChange } from '@/components/admin-users/confirm-dialog';
import { useEndSkinToSkinMutation, useStartSkinToSkinMutation } from '@/components/queries/infants';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { formatWhen } from '@/components/ui/format-time';
import { Caution } from '@/components/ui/caution';
import { Segmented } from '@/components/ui/segmented';
import { StatusBadge } from '@/components/ui/status-badge';
import { Text } from '@/components/ui/text';
import { TextField } from '@/components/ui/text-field';
import { SKIN_TO_SKIN_LIMITS_CENTI } from '@/shared/thermal/skin-to-skin';
import { fromCentiCelsius } from '@/shared/thermal/units';
import type { Flowsheet, SessionRecord } from '@/shared/types/bedside';
import { clockTime, duration, SITE_LABELS, temp, tempDelta } from './format';
import { parseNumber } from './reading-form-values';

interface StartSessionFormValues {
  reference: string;
  limit: '50' | '100';
  carer: string;
}

/** The running session, or a way to start one. */
export function SkinToSkinPanel({ sheet, canChart, now }: { sheet: Flowsheet; canChart: boolean; now: Date }) {
  const [starting, setStarting] = useState(false);
  if (sheet.infant.skinToSkin) return <RunningSession sheet={sheet} canChart={canChart} now={now} />;
  if (!canChart) return null;
  if (!starting) return <Button label="Start skin-to-skin" icon="hands" variant="secondary" style={styles.start} onPress={() => setStarting(true)} />;
  return <StartSessionForm sheet={sheet} onDone={() => setStarting(false)} />;
}

function RunningSession({ sheet, canChart, now }: { sheet: Flowsheet; canChart: boolean; now: Date }) {
  const user = useUser();
  const s = sheet.infant.skinToSkin!;
  const end = useEndSkinToSkinMutation(sheet.infant.id);
  const record = sheet.sessions.find((x) => x.id === s.id);
  const [confirm, setConfirm] = useState<PendingChange | null>(null);
  // Ending asks first: an ended session cannot be resumed, and its readings stop counting against the limit.
  const askToEnd = () =>
    setConfirm({
      title: 'End the skin-to-skin session?',
      lines: [
        `Running for ${duration(now.getTime() - Date.parse(s.startedAt))}, since ${clockTime(s.startedAt, sheet.infant.timeZone, user.clock)}${record?.carer ? ` with ${record.carer}` : ''}.`,
        'Readings charted after this no longer count against its deviation limit.',
      ],
      confirmLabel: 'End session',
      run: () => end.mutateAsync(s.id),
    });
  return (
    <Card role="region" aria-label="Skin-to-skin session">
      <StatusBadge tone="together" icon="hands" label="Skin-to-skin session running" large />
      <Text variant="bodyStrong">{duration(now.getTime() - Date.parse(s.startedAt))} so far</Text>
      <Text>
        Since {clockTime(s.startedAt, sheet.infant.timeZone, user.clock)}
        {record?.carer ? ` with ${record.carer}` : ''} · reference {temp(s.referenceCenti, user.tempUnit)} · deviation limit {tempDelta(s.limitCenti, user.tempUnit)}
      </Text>
      <Text variant="caption" tone="muted">
        Readings charted now count against the deviation limit; one outside it raises a flag.
      </Text>
      {canChart ? <Button label="End session" variant="secondary" style={styles.start} busy={end.isPending} onPress={askToEnd} /> : null}
      <ConfirmDialog change={confirm} onClose={() => setConfirm(null)} />
    </Card>
  );
}

/**
 * The sessions of the window, newest first, as part of the record: start and end (or still
 * running), the carer, the reference and limit, who started it, and the readings taken during it.
 */
export function SkinToSkinHistory({ sheet, now }: { sheet: Flowsheet; now: Date }) {
  if (!sheet.sessions.length) return null;
  const sessions = [...sheet.sessions].sort((a, b) => Date.parse(b.startedAt) - Date.parse(a.startedAt));
  return (
    <Card role="region" aria-label="Skin-to-skin sessions">
      <Text variant="title" role="heading" aria-level={2}>
        Skin-to-skin sessions
      </Text>
      {sessions.map((s) => (
        <SessionEntry key={s.id} session={s} sheet={sheet} now={now} />
      ))}
    </Card>
  );
}

function SessionEntry({ session: s, sheet, now }: { session: SessionRecord; sheet: Flowsheet; now: Date }) {
  const user = useUser();
  const tz = sheet.infant.timeZone;
  const when = (iso: string) => formatWhen(iso, tz, user.clock, now);
  const endMs = s.endedAt ? Date.parse(s.endedAt) : now.getTime();
  // Oldest first inside a session: the story of the session as it went.
  const readings = sheet.readings.filter((r) => r.sessionId === s.id).sort((a, b) => Date.parse(a.takenAt) - Date.parse(b.takenAt));
  return (
    <View style={styles.session} role="group" aria-label={`Skin-to-skin from ${when(s.startedAt)}`}>
      <Text variant="bodyStrong">
        {when(s.startedAt)} – {s.endedAt ? when(s.endedAt) : 'still running'} ({duration(endMs - Date.parse(s.startedAt))})
      </Text>
      <Text>
        {s.carer ? `With ${s.carer}` : 'Carer not named'} · reference {temp(s.referenceCenti, user.tempUnit)} · deviation limit {tempDelta(s.limitCenti, user.tempUnit)}
      </Text>
      <Text variant="caption" tone="muted">
        Started by {s.startedBy.name}
      </Text>
      {readings.length ? (
        <View role="list" aria-label="Readings during the session" style={styles.readings}>
          {readings.map((r) => (
            <Text key={r.id} role="listitem" variant="caption">
              {when(r.takenAt)} · probe {temp(r.probeCenti, user.tempUnit)} · remote {temp(r.remoteCenti, user.tempUnit)}
              {r.remoteSite ? ` (${SITE_LABELS[r.remoteSite].toLowerCase()})` : ''}
              {r.heartRate !== null ? ` · HR ${r.heartRate}/min` : ''} · {r.recordedBy.name}
            </Text>
          ))}
        </View>
      ) : (
        <Text variant="caption" tone="muted">
          No readings charted during it.
        </Text>
      )}
    </View>
  );
}

function StartSessionForm({ sheet, onDone }: { sheet: Flowsheet; onDone: () => void }) {
  const user = useUser();
  const unit = user.tempUnit;
  const mutation = useStartSkinToSkinMutation(sheet.infant.id);
  const [id] = useState(() => globalThis.crypto.randomUUID());
  const latestRemote = sheet.infant.latest.remote?.centi ?? null;
  const resolver = useMemo(() => lazyZodResolver<StartSessionFormValues>((m) => m.startSessionFormSchema(unit)), [unit]);
  useEffect(() => resolver.preload(), [resolver]);
  const { control, handleSubmit, setValue } = useForm<StartSessionFormValues>({
    resolver,
    defaultValues: { reference: latestRemote === null ? '' : fromCentiCelsius(latestRemote, unit).toFixed(1), limit: '50', carer: '' },
  });
  const limit = useWatch({ control, name: 'limit' });
  const problem = mutation.isError ? problemOf(mutation.error) : null;
  const submit = handleSubmit((v) =>
    mutation.mutate({ id, unit, reference: parseNumber(v.reference) as number, limitCenti: Number(v.limit) as 50 | 100, carer: v.carer.trim() || null }, { onSuccess: onDone }),
  );
  return (
    <Card role="region" aria-label="Start a skin-to-skin session">
      <Text variant="title" role="heading" aria-level={2}>
        Start skin-to-skin
      </Text>
      <Segmented
        label="Deviation limit"
        value={limit}
        options={SKIN_TO_SKIN_LIMITS_CENTI.map((c) => ({ value: String(c) as '50' | '100', label: `± ${tempDelta(c, unit)}` }))}
        onChange={(v) => setValue('limit', v)}
      />
      <TextField
        control={control}
        name="reference"
        label={`Reference temperature (°${unit})`}
        hint="Usually the last remote-site temperature."
        suffix={`°${unit}`}
        inputMode="decimal"
        keyboardType="decimal-pad"
        serverError={problem && 'fields' in problem ? problem.fields?.reference : undefined}
      />
      <TextField
        control={control}
        name="carer"
        label="Carer (optional)"
        placeholder="For example: mother"
        serverError={problem && 'fields' in problem ? problem.fields?.carer : undefined}
      />
      <View style={styles.row}>
        <FormRootError control={control} />
        <Button label="Start session" icon="hands" busy={mutation.isPending} onPress={() => void submit()} />
        <Button label="Cancel" variant="quiet" onPress={onDone} />
      </View>
      {problem ? (
        <Text tone="danger" role="alert">
          {problem.message}
        </Text>
      ) : null}
      <Caution />
    </Card>
  );
}

const styles = StyleSheet.create({
  row: { flexDirection: 'row', flexWrap: 'wrap', gap: 12 },
  start: { alignSelf: 'flex-start' },
  session: { gap: 4, paddingVertical: 6 },
  readings: { gap: 2, paddingLeft: 8 },
});
