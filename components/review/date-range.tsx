import { StyleSheet, TextInput, View } from 'react-native';
import { TOUCH_TARGET } from '@/components/theme/theme';
import { useTheme } from '@/components/theme/theme-provider';
import { Text } from '@/components/ui/text';

/** Two local dates as YYYY-MM-DD; an empty field means no limit. */
export function DateRange({ from, to, onChange, error }: { from: string; to: string; onChange: (next: { from: string; to: string }) => void; error?: string }) {
  const theme = useTheme();
  const input = [
    styles.input,
    theme.type.body,
    { color: theme.colors.text, backgroundColor: theme.colors.surfaceSunken, borderColor: error ? theme.colors.danger : theme.colors.border },
  ];
  return (
    <View style={styles.wrap}>
      <View style={styles.row}>
        <View style={styles.field}>
          <Text variant="label">From</Text>
          <TextInput
            accessibilityLabel="From date"
            placeholder="YYYY-MM-DD"
            placeholderTextColor={theme.colors.textMuted}
            value={from}
            onChangeText={(v) => onChange({ from: v, to })}
            style={input}
          />
        </View>
        <View style={styles.field}>
          <Text variant="label">To</Text>
          <TextInput
            accessibilityLabel="To date"
            placeholder="YYYY-MM-DD"
            placeholderTextColor={theme.colors.textMuted}
            value={to}
            onChangeText={(v) => onChange({ from, to: v })}
            style={input}
          />
        </View>
      </View>
      {error ? (
        <Text variant="caption" tone="danger" role="alert">
          {error}
        </Text>
      ) : null}
    </View>
  );
}

export const isDate = (v: string) => /^\d{4}-\d{2}-\d{2}$/.test(v);

const styles = StyleSheet.create({
  wrap: { gap: 4 },
  row: { flexDirection: 'row', gap: 12, flexWrap: 'wrap' },
  field: { gap: 4, minWidth: 150, flexGrow: 1 },
  input: { minHeight: TOUCH_TARGET, borderWidth: 2, borderRadius: 10, paddingHorizontal: 12 },
});
