import { useEffect, useMemo, useState } from 'react';
import { useForm, useWatch } from 'react-hook-form';
import { StyleSheet, View } from 'react-native';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { Segmented } from '@/components/ui/segmented';
import { StatusBadge } from '@/components/ui/status-badge';
import { Text } from '@/components/ui/text';
import { TextField } from '@/components/ui/text-field';
import { lazyZodResolver } from '@/components/forms/lazy-resolver';
import { FormRootError } from '@/components/forms/form-root-error';
import { useFocusServerError } from '@/components/forms/focus-server-error';
import type { CorrectReadingInput } from '@/shared/schemas/bedside';
import { fromCentiCelsius, type TempUnit } from '@/shared/thermal/units';
import type { CorrectionReason, ReadingVersion } from '@/shared/types/bedside';
import { formatClock, formatDayAndTime, formatDayTime, localDayKey } from '@/components/ui/format-time';
import { CORRECTION_REASON_LABELS, REMOTE_SITE_OPTIONS, temp } from './format';
import { dayOf, implausibleReasons, takenAtOf, toCreateReading, type ReadingFormValues } from './reading-form-values';
import { readingDrafts } from './reading-draft';
import { TakenAtField } from './taken-at-field';

export interface CorrectReadingFormValues extends ReadingFormValues {
  reason: CorrectionReason;
  why: string;
}

/** The server's field names for a correction, in the form's order. */
const SERVER_FIELD_ORDER = [
  ['note', 'why'],
  ['values.probe', 'probe'],
  ['values.remote', 'remote'],
  ['values.set', 'set'],
  ['values.air', 'air'],
  ['values.heartRate', 'heartRate'],
  ['values.takenAt', 'time'],
] as const;

const str = (centi: number | null, unit: TempUnit) => (centi === null ? '' : fromCentiCelsius(centi, unit).toFixed(1));

export interface CorrectReadingFormProps {
  reading: ReadingVersion;
  unit: TempUnit;
  timeZone: string;
  clock: '24h' | '12h';
  now?: () => Date;
  makeId?: () => string;
  busy?: boolean;
  serverFields?: Record<string, string>;
  serverMessage?: string | null;
  onSubmit: (body: CorrectReadingInput) => void;
  onCancel?: () => void;
  /**
   * Keep what she changes as a draft on this device (per reading and per user): it comes back
   * after a reload or going back, and goes when the correction is saved or she discards it.
   */
  draft?: { userId: string; infantId: string; label: string };
}

/** A correction never edits the reading: it saves a new version with the reason, who and when. */
export function CorrectReadingForm({
  reading,
  unit,
  timeZone,
  clock,
  now = () => new Date(),
  makeId = () => globalThis.crypto.randomUUID(),
  busy,
  serverFields = {},
  serverMessage,
  onSubmit,
  onCancel,
  draft,
}: CorrectReadingFormProps) {
  const resolver = useMemo(() => lazyZodResolver<CorrectReadingFormValues>((m) => m.correctReadingFormSchema(unit, timeZone, now)), [unit, timeZone, now]);
  useEffect(() => resolver.preload(), [resolver]);
  // The reading's own day and time: kept unless she changes them.
  const originalTime = formatClock(reading.takenAt, timeZone, '24h');
  const originalDay = localDayKey(reading.takenAt, timeZone);
  const defaults: CorrectReadingFormValues = {
    reason: 'corrected-value',
    why: '',
    probe: str(reading.probeCenti, unit),
    remote: str(reading.remoteCenti, unit),
    remoteSite: reading.remoteSite ?? 'axilla',
    air: str(reading.airCenti, unit),
    set: str(reading.setCenti, unit),
    controlMode: reading.controlMode,
    heaterOutputPct: reading.heaterOutputPct === null ? '' : String(reading.heaterOutputPct),
    heartRate: reading.heartRate === null ? '' : String(reading.heartRate),
    heatSigns: reading.heatSigns as ReadingFormValues['heatSigns'],
    note: reading.note ?? '',
    time: originalTime,
    day: originalDay,
    lateReason: '',
  };
  // This user's draft of this reading's correction, found when the form opened.
  const [restored, setRestored] = useState(() => (draft ? readingDrafts.get(draft.userId, draft.infantId, reading.id) : null));
  const { control, handleSubmit, setValue, setFocus, reset } = useForm<CorrectReadingFormValues>({
    resolver,
    defaultValues: { ...defaults, ...restored?.values },
  });
  const reason = useWatch({ control, name: 'reason' }) as CorrectionReason;
  // A refusal names fields: the first takes focus (not a request to confirm unusual values).
  useFocusServerError(serverFields['values.confirmedImplausible'] === 'confirm' ? undefined : serverFields, setFocus, SERVER_FIELD_ORDER);
  const remoteSite = useWatch({ control, name: 'remoteSite' });
  const [id, setId] = useState(() => restored?.readingId ?? makeId());
  const [defaultsJson] = useState(() => JSON.stringify(defaults));
  const all = useWatch({ control });
  useEffect(() => {
    if (!draft) return;
    // Only what differs from the reading as charted is worth a draft.
    const changed = JSON.stringify({ ...defaults, ...all }) !== defaultsJson;
    if (changed) readingDrafts.keep({ userId: draft.userId, infantId: draft.infantId, correcting: reading.id, readingId: id, label: draft.label, values: all });
    else readingDrafts.remove(draft.userId, draft.infantId, reading.id);
    // eslint-disable-next-line react-hooks/exhaustive-deps -- the defaults are fixed when the form opens.
  }, [all, draft?.userId, draft?.infantId, draft?.label, reading.id, id, defaultsJson]);
  const discard = () => {
    if (draft) readingDrafts.remove(draft.userId, draft.infantId, reading.id);
    setRestored(null);
    setId(makeId());
    setConfirming(null);
    reset(defaults);
  };
  const [confirming, setConfirming] = useState<string[] | null>(null);
  const u = `°${unit}`;
  const withValues = reason !== 'entered-in-error';
  const f = (name: string) => serverFields[`values.${name}`];

  const submit = (confirmed: boolean) =>
    handleSubmit((v) => {
      const body: CorrectReadingInput = { id, reason: v.reason, note: v.why.trim() };
      if (v.reason !== 'entered-in-error') {
        const reasons = implausibleReasons(v, unit);
        if (reasons.length && !confirmed) {
          setConfirming(reasons);
          return;
        }
        const at = now();
        // Only a changed day or time is sent; otherwise the reading keeps its own instant.
        const taken = takenAtOf(v, at, timeZone);
        const changed = taken.kind === 'at' && (v.time.trim() !== originalTime || dayOf(v, at, timeZone) !== originalDay);
        const created = toCreateReading({ ...v, time: '', day: '', lateReason: '' }, { id, unit, now: at, timeZone, confirmed: reasons.length > 0 });
        const { id: _id, lateReason: _late, takenAt: _takenAt, ...values } = created;
        body.values = { ...values, ...(changed ? { takenAt: taken.at.toISOString() } : {}) };
      }
      setConfirming(null);
      onSubmit(body);
    });

  return (
    <View style={styles.form}>
      {restored ? (
        <Card role="status">
          <Text variant="bodyStrong">{`Draft kept from ${draftTime(restored.updatedAt, timeZone, clock, now())}`}</Text>
          <Text variant="caption" tone="muted">
            Your correction as you left it. Check it, then save, or discard the draft.
          </Text>
          <View style={styles.actions}>
            <Button label="Discard draft" variant="secondary" compact onPress={discard} />
          </View>
        </Card>
      ) : null}
      <Card>
        <Text variant="label">Correcting the reading of {formatDayAndTime(reading.takenAt, timeZone, clock, now())}</Text>
        <Text>
          Probe {temp(reading.probeCenti, unit)} · Remote {temp(reading.remoteCenti, unit)} · Set {temp(reading.setCenti, unit)}
        </Text>
        <Text variant="caption" tone="muted">
          The reading stays in the chart&apos;s history; the correction is saved as a new version under your name.
        </Text>
      </Card>
      <Segmented
        label="Why correct it?"
        value={reason}
        options={(Object.keys(CORRECTION_REASON_LABELS) as CorrectionReason[]).map((r) => ({ value: r, label: CORRECTION_REASON_LABELS[r] }))}
        onChange={(r) => setValue('reason', r)}
      />
      <TextField control={control} name="why" label={reason === 'late-entry' ? 'Why it was charted late' : 'What was wrong'} multiline serverError={serverFields.note} />
      {withValues ? (
        <>
          <TextField control={control} name="probe" label={`Probe temperature (${u})`} suffix={u} inputMode="decimal" keyboardType="decimal-pad" serverError={f('probe')} />
          <TextField control={control} name="remote" label={`Remote-site temperature (${u})`} suffix={u} inputMode="decimal" keyboardType="decimal-pad" serverError={f('remote')} />
          <Segmented label="Remote site" value={remoteSite} options={REMOTE_SITE_OPTIONS} onChange={(site) => setValue('remoteSite', site)} />
          <TextField control={control} name="set" label={`Set temperature (${u})`} suffix={u} inputMode="decimal" keyboardType="decimal-pad" serverError={f('set')} />
          <TextField control={control} name="air" label={`Air temperature (${u})`} suffix={u} inputMode="decimal" keyboardType="decimal-pad" serverError={f('air')} />
          <TextField control={control} name="heartRate" label="Heart rate (/min)" suffix="/min" inputMode="numeric" keyboardType="number-pad" serverError={f('heartRate')} />
          <TakenAtField control={control} timeZone={timeZone} now={now} label="Time taken" alsoDay={originalDay} serverError={f('takenAt')} />
        </>
      ) : (
        <StatusBadge tone="warning" icon="alert" label="The reading will be removed from the chart; its history stays." />
      )}
      {confirming ? (
        <Card role="alert">
          <StatusBadge tone="warning" icon="alert" label="Confirm unusual values" />
          {confirming.map((r) => (
            <Text key={r}>{r}</Text>
          ))}
          <Button label="Confirm and save correction" variant="danger" busy={busy} onPress={() => void submit(true)()} />
        </Card>
      ) : null}
      <View style={styles.actions}>
        <Button label="Save correction" icon="check" busy={busy} onPress={() => void submit(false)()} />
        {onCancel ? <Button label="Cancel" variant="quiet" onPress={onCancel} /> : null}
      </View>
      <FormRootError control={control} />
      {serverMessage ? (
        <Text tone="danger" role="alert">
          {serverMessage}
        </Text>
      ) : null}
    </View>
  );
}

/** "03:12", or with the day when the draft is from another day. */
function draftTime(iso: string, timeZone: string, clock: '24h' | '12h', at: Date): string {
  const today = formatDayTime(at, timeZone, clock).split(',')[0];
  const day = formatDayTime(iso, timeZone, clock);
  return day.split(',')[0] === today ? formatClock(iso, timeZone, clock) : day;
}

const styles = StyleSheet.create({
  form: { gap: 14, width: '100%', maxWidth: 560 },
  actions: { flexDirection: 'row', flexWrap: 'wrap', gap: 12 },
});
