import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { StyleSheet, View } from 'react-native';
import type { AdminBed, AdminUnit } from '@/shared/types/admin';
import { problemOf } from '@/components/api/client';
import { lazyZodResolver } from '@/components/forms/lazy-resolver';
import { FormRootError } from '@/components/forms/form-root-error';
import { useAddBedMutation, useUnitSettingsMutation, useUpdateBedMutation } from '@/components/queries/admin';
import { TimeZonePicker } from './time-zone-picker';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { Text } from '@/components/ui/text';
import { TextField } from '@/components/ui/text-field';

export interface UnitSettingsFormValues {
  checkIntervalMinutes: string;
  dueSoonMinutes: string;
  gapLimit: string;
  escalationDelayMinutes: string;
  dayShiftStart: string;
  nightShiftStart: string;
  timeZone: string;
  newBed: string;
}
type FormValues = UnitSettingsFormValues;
/** The form's labels by the server's field names, to name each field at fault. */
const LABELS: Record<string, string> = {
  checkIntervalMinutes: 'Check interval',
  dueSoonMinutes: 'Due-soon window',
  gapLimitCenti: 'Gap limit',
  escalationDelayMinutes: 'Escalation delay',
  dayShiftStart: 'Day shift starts',
  nightShiftStart: 'Night shift starts',
  timeZone: 'Time zone',
};
const unitSettingsResolver = lazyZodResolver<FormValues>((m) => m.unitSettingsFormSchema);

/** One unit's thermal-care settings and its beds. */
export function UnitSettingsCard({ unit }: { unit: AdminUnit }) {
  const save = useUnitSettingsMutation();
  const addBed = useAddBedMutation();
  const [fields, setFields] = useState<Record<string, string>>({});
  const [status, setStatus] = useState<string | null>(null);
  const { control, handleSubmit, getValues, setValue, formState } = useForm<FormValues>({
    resolver: unitSettingsResolver,
    defaultValues: {
      checkIntervalMinutes: String(unit.checkIntervalMinutes),
      dueSoonMinutes: String(unit.dueSoonMinutes),
      gapLimit: (unit.gapLimitCenti / 100).toFixed(2),
      escalationDelayMinutes: String(unit.escalationDelayMinutes),
      dayShiftStart: unit.dayShiftStart,
      nightShiftStart: unit.nightShiftStart,
      timeZone: unit.timeZone,
      newBed: '',
    },
  });
  const onSubmit = handleSubmit(async (v) => {
    setFields({});
    setStatus(null);
    try {
      await save.mutateAsync({
        id: unit.id,
        input: {
          checkIntervalMinutes: Number(v.checkIntervalMinutes),
          dueSoonMinutes: Number(v.dueSoonMinutes),
          gapLimitCenti: Math.round(Number(v.gapLimit) * 100),
          escalationDelayMinutes: Number(v.escalationDelayMinutes),
          dayShiftStart: v.dayShiftStart,
          nightShiftStart: v.nightShiftStart,
          timeZone: v.timeZone,
        },
      });
      setStatus('Settings saved.');
    } catch (err) {
      const p = problemOf(err);
      if (p.kind === 'invalid' && p.fields) {
        setFields({ ...p.fields, gapLimit: p.fields.gapLimitCenti ?? '' });
        const named = Object.keys(p.fields).map((k) => LABELS[k] ?? k);
        setStatus(`${named.length === 1 ? 'One setting needs' : `${named.length} settings need`} attention: ${named.join(', ')}. Each reason is under its field.`);
      } else setStatus(p.message);
    }
  });
  const onAddBed = async () => {
    const label = getValues('newBed').trim();
    if (!label) return;
    try {
      await addBed.mutateAsync({ unitId: unit.id, label });
      setValue('newBed', '');
      setStatus(`Bed ${label} added.`);
    } catch (err) {
      setStatus(problemOf(err).message);
    }
  };
  return (
    <Card>
      <Text variant="title" role="heading" aria-level={2}>
        {unit.name}: settings
      </Text>
      <View style={styles.grid}>
        <TextField control={control} name="checkIntervalMinutes" label="Check interval" suffix="min" keyboardType="number-pad" serverError={fields.checkIntervalMinutes} />
        <TextField control={control} name="dueSoonMinutes" label="Due-soon window" suffix="min" keyboardType="number-pad" serverError={fields.dueSoonMinutes} />
        <TextField control={control} name="gapLimit" label="Gap limit" suffix="°C" keyboardType="decimal-pad" serverError={fields.gapLimit || undefined} />
        <TextField control={control} name="escalationDelayMinutes" label="Escalation delay" suffix="min" keyboardType="number-pad" serverError={fields.escalationDelayMinutes} />
        <TextField control={control} name="dayShiftStart" label="Day shift starts" serverError={fields.dayShiftStart} />
        <TextField control={control} name="nightShiftStart" label="Night shift starts" serverError={fields.nightShiftStart} />
        <TimeZonePicker control={control} name="timeZone" label="Time zone" serverError={fields.timeZone} />
      </View>
      <FormRootError control={control} />
      <Button label={`Save ${unit.name} settings`} onPress={() => void onSubmit()} busy={formState.isSubmitting} />
      <Text variant="label">Beds</Text>
      <View role="list" aria-label={`${unit.name} beds`}>
        {unit.beds.map((b, i) => (
          <BedRow key={b.id} bed={b} first={i === 0} last={i === unit.beds.length - 1} />
        ))}
      </View>
      <View style={styles.row}>
        <View style={styles.grow}>
          <TextField control={control} name="newBed" label="New bed label" autoCapitalize="characters" />
        </View>
        <Button label="Add bed" icon="plus" variant="secondary" onPress={() => void onAddBed()} busy={addBed.isPending} />
      </View>
      {status ? <Text role="status">{status}</Text> : null}
    </Card>
  );
}

/** One bed: rename it, move it up or down the unit's order, take it out of use or back. */
function BedRow({ bed, first, last }: { bed: AdminBed; first: boolean; last: boolean }) {
  const update = useUpdateBedMutation();
  const [renaming, setRenaming] = useState(false);
  const [message, setMessage] = useState<string | null>(null);
  const form = useForm<{ label: string }>({ defaultValues: { label: bed.label } });
  const run = async (input: { label?: string; active?: boolean; move?: 'up' | 'down' }, done: string) => {
    setMessage(null);
    try {
      await update.mutateAsync({ bedId: bed.id, input });
      setMessage(done);
      setRenaming(false);
    } catch (err) {
      const p = problemOf(err);
      setMessage((p.kind === 'invalid' || p.kind === 'conflict') && p.fields?.label ? `Bed "${input.label ?? bed.label}": ${p.fields.label}` : p.message);
    }
  };
  return (
    <View role="listitem" aria-label={`Bed ${bed.label}${bed.active ? '' : ', out of use'}`} style={styles.bed}>
      <View style={styles.row}>
        <Text variant="bodyStrong" style={styles.bedLabel}>
          {bed.label}
        </Text>
        {!bed.active ? (
          <Text tone="muted" variant="caption">
            out of use
          </Text>
        ) : null}
        <Button compact variant="quiet" label={`Move ${bed.label} up`} disabled={first} onPress={() => void run({ move: 'up' }, `Bed ${bed.label} moved up.`)} />
        <Button compact variant="quiet" label={`Move ${bed.label} down`} disabled={last} onPress={() => void run({ move: 'down' }, `Bed ${bed.label} moved down.`)} />
        <Button compact variant="quiet" label={renaming ? 'Cancel' : `Rename ${bed.label}`} onPress={() => setRenaming(!renaming)} />
        <Button
          compact
          variant="quiet"
          label={bed.active ? `Take ${bed.label} out of use` : `Put ${bed.label} back in use`}
          onPress={() => void run({ active: !bed.active }, bed.active ? `Bed ${bed.label} is out of use.` : `Bed ${bed.label} is back in use.`)}
        />
      </View>
      {renaming ? (
        <View style={styles.row}>
          <View style={styles.grow}>
            <TextField control={form.control} name="label" label={`New label for ${bed.label}`} autoCapitalize="characters" />
          </View>
          <Button
            compact
            label="Save label"
            onPress={() => void run({ label: form.getValues('label').trim() }, `Bed renamed to ${form.getValues('label').trim()}.`)}
            busy={update.isPending}
          />
        </View>
      ) : null}
      {message ? (
        <Text role="status" variant="caption">
          {message}
        </Text>
      ) : null}
    </View>
  );
}

const styles = StyleSheet.create({
  bed: { gap: 4, paddingVertical: 4 },
  bedLabel: { minWidth: 56 },
  grid: { flexDirection: 'row', flexWrap: 'wrap', gap: 12 },
  row: { flexDirection: 'row', gap: 8, alignItems: 'flex-end', flexWrap: 'wrap' },
  grow: { flexGrow: 1, minWidth: 160 },
});
