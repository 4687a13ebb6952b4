import { useController, useWatch, type Control, type FieldValues, type Path } from 'react-hook-form';
import { StyleSheet, View } from 'react-native';
import { dayKeyName, formatDayAndTime, localDayKey, shiftDayKey } from '@/components/ui/format-time';
import { Segmented } from '@/components/ui/segmented';
import { Text } from '@/components/ui/text';
import { TextField } from '@/components/ui/text-field';
import { isFuture, takenAtOf } from './reading-form-values';

/** Today, yesterday and the two days before: a reading charted late, or corrected, within the flowsheet's 72 hours. */
const DAYS_BACK = 3;

export interface TakenAtFieldProps<T extends FieldValues> {
  control: Control<T>;
  /** The unit's zone: the day and the time are the unit's wall clock. */
  timeZone: string;
  now: () => Date;
  label: string;
  placeholder?: string;
  /** A day to offer besides the last few (a corrected reading's own day). */
  alsoDay?: string;
  serverError?: string;
}

/**
 * When a reading was taken: the day, named (Today, Yesterday, or a date), and the time on it.
 * Nothing is guessed: a time later than now is refused, never moved to yesterday. The result is
 * written out ("Taken: Yesterday, 23:40") so she sees the day the chart will show.
 */
export function TakenAtField<T extends FieldValues>({ control, timeZone, now, label, placeholder, alsoDay, serverError }: TakenAtFieldProps<T>) {
  const { field: day } = useController({ control, name: 'day' as Path<T> });
  const time = useWatch({ control, name: 'time' as Path<T> }) as string | undefined;
  const at = now();
  const today = localDayKey(at, timeZone);
  const keys = Array.from({ length: DAYS_BACK + 1 }, (_, i) => shiftDayKey(today, -i));
  const chosen = (day.value as string | undefined)?.trim() || today;
  // The reading's own day, or a day kept in a draft, stays on offer however far back it is.
  for (const extra of [alsoDay, chosen]) if (extra && !keys.includes(extra)) keys.push(extra);
  const values = { time: time ?? '', day: chosen === today ? '' : chosen };
  const taken = takenAtOf(values, at, timeZone);

  return (
    <View style={styles.wrap} role="group" aria-label="When it was taken">
      <Segmented
        label="Day taken"
        value={chosen}
        options={keys.map((key) => ({ value: key, label: dayKeyName(key, timeZone, at) }))}
        // Today is kept as "today", so a form left open past midnight still means the day it is saved.
        onChange={(key) => day.onChange(key === today ? '' : key)}
      />
      <TextField
        control={control}
        name={'time' as Path<T>}
        label={label}
        placeholder={placeholder}
        hint={`HH:MM, ${timeZone} time`}
        inputMode="numeric"
        serverError={serverError}
      />
      <Text variant="caption" tone={taken.kind === 'at' && isFuture(values, at, timeZone) ? 'danger' : 'muted'} aria-live="polite">
        {taken.kind === 'now' ? 'Taken: now, when you save.' : taken.kind === 'at' ? `Taken: ${formatDayAndTime(taken.at, timeZone, '24h', at)}` : ' '}
      </Text>
    </View>
  );
}

const styles = StyleSheet.create({
  wrap: { gap: 8 },
});
