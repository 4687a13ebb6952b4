import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { StyleSheet, View } from 'react-native';
import { problemOf } from '@/components/api/client';
import { useCreateUnitMutation } from '@/components/queries/admin';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { Text } from '@/components/ui/text';
import { TextField } from '@/components/ui/text-field';
import { TimeZonePicker } from './time-zone-picker';

interface Values {
  name: string;
  hospitalName: string;
  timeZone: string;
}

/** A new unit with the usual settings; its administrator then adds beds and people. */
export function CreateUnitCard() {
  const create = useCreateUnitMutation();
  const [fields, setFields] = useState<Record<string, string>>({});
  const [status, setStatus] = useState<string | null>(null);
  const { control, handleSubmit, reset } = useForm<Values>({ defaultValues: { name: '', hospitalName: '', timeZone: 'Europe/London' } });
  const onSubmit = handleSubmit(async (v) => {
    setFields({});
    setStatus(null);
    try {
      const res = await create.mutateAsync({ name: v.name.trim(), hospitalName: v.hospitalName.trim(), timeZone: v.timeZone.trim() });
      setStatus(`${res.unit.name} created. Add its beds below and its people under People.`);
      reset();
    } catch (err) {
      const p = problemOf(err);
      if ((p.kind === 'invalid' || p.kind === 'conflict') && p.fields) setFields(p.fields);
      setStatus(p.message);
    }
  });
  return (
    <Card>
      <Text variant="title" role="heading" aria-level={2}>
        Create a unit
      </Text>
      <View style={styles.grid}>
        <View style={styles.cell}>
          <TextField control={control} name="name" label="Unit name" serverError={fields.name} />
        </View>
        <View style={styles.cell}>
          <TextField control={control} name="hospitalName" label="Hospital" serverError={fields.hospitalName} />
        </View>
        <TimeZonePicker control={control} name="timeZone" label="Unit time zone" serverError={fields.timeZone} />
      </View>
      <Button label="Create unit" icon="plus" variant="secondary" busy={create.isPending} onPress={() => void onSubmit()} />
      {status ? <Text role="status">{status}</Text> : null}
    </Card>
  );
}

const styles = StyleSheet.create({
  grid: { flexDirection: 'row', flexWrap: 'wrap', gap: 12 },
  cell: { flexGrow: 1, minWidth: 220 },
});
