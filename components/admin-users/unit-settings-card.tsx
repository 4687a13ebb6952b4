import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { StyleSheet, View } from 'react-native';
import type { AdminUnit } from '@/shared/types/admin';
import { problemOf } from '../api/client';
import { lazyZodResolver } from '../forms/lazy-resolver';
import { FormRootError } from '../forms/form-root-error';
import { useAddBedMutation, useUnitSettingsMutation } from '../queries/admin';
import { Button } from '../ui/button';
import { Card } from '../ui/card';
import { Text } from '../ui/text';
import { TextField } from '../ui/text-field';

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
      if (p.kind === 'invalid') setFields({ ...p.fields, gapLimit: p.fields.gapLimitCenti ?? '' });
      setStatus(p.message);
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
        <TextField control={control} name="timeZone" label="Time zone" autoCapitalize="none" serverError={fields.timeZone} />
      </View>
      <FormRootError control={control} />
      <Button label={`Save ${unit.name} settings`} onPress={() => void onSubmit()} busy={formState.isSubmitting} />
      <Text variant="label">Beds</Text>
      <Text tone="muted">{unit.beds.map((b) => (b.active ? b.label : `${b.label} (out of use)`)).join(', ')}</Text>
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

const styles = StyleSheet.create({
  grid: { flexDirection: 'row', flexWrap: 'wrap', gap: 12 },
  row: { flexDirection: 'row', gap: 8, alignItems: 'flex-end', flexWrap: 'wrap' },
  grow: { flexGrow: 1, minWidth: 160 },
});
