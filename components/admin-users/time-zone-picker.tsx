import { useMemo } from 'react';
import { useController, type Control, type FieldValues, type Path } from 'react-hook-form';
import { StyleSheet, View } from 'react-native';
import { Button } from '@/components/ui/button';
import { TextField } from '@/components/ui/text-field';
import { Text } from '@/components/ui/text';

/** The canonical IANA zones this browser knows, plus UTC (the server checks against its own list). */
export const CANONICAL_ZONES: readonly string[] = [...new Set([...Intl.supportedValuesOf('timeZone'), 'UTC'])].sort();

/**
 * A time-zone field that offers canonical zones as you type ("lond" offers Europe/London); choosing
 * one fills the field with its exact spelling.
 */
export function TimeZonePicker<T extends FieldValues>({ control, name, label, serverError }: { control: Control<T>; name: Path<T>; label: string; serverError?: string }) {
  const { field } = useController({ control, name });
  const text = String(field.value ?? '');
  const matches = useMemo(() => {
    const needle = text.trim().toLowerCase().replace(/\s+/g, '_');
    if (!needle || CANONICAL_ZONES.includes(text)) return [];
    return CANONICAL_ZONES.filter((z) => z.toLowerCase().includes(needle)).slice(0, 6);
  }, [text]);
  return (
    <View style={styles.wrap}>
      <TextField control={control} name={name} label={label} hint="A place name, e.g. Europe/London" autoCapitalize="none" autoCorrect={false} serverError={serverError} />
      {matches.length ? (
        <View role="list" aria-label={`${label}: matching zones`} style={styles.list}>
          {matches.map((z) => (
            <View role="listitem" key={z}>
              <Button compact variant="quiet" label={z} onPress={() => field.onChange(z)} />
            </View>
          ))}
        </View>
      ) : text.trim() && !CANONICAL_ZONES.includes(text) ? (
        <Text variant="caption" tone="warning">
          No canonical zone matches; try a city such as London or New_York.
        </Text>
      ) : null}
    </View>
  );
}

const styles = StyleSheet.create({
  wrap: { gap: 4, minWidth: 220, flexGrow: 1 },
  list: { flexDirection: 'row', flexWrap: 'wrap', gap: 4 },
});
