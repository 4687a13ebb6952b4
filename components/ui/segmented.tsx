import { Pressable, StyleSheet, View } from 'react-native';
import { TOUCH_TARGET } from '../theme/theme';
import { useTheme } from '../theme/theme-provider';
import { Text } from './text';

export interface SegmentedOption<T extends string> {
  value: T;
  label: string;
}

/** A small set of choices, one chosen: a radio group to assistive technology. */
export function Segmented<T extends string>({ label, options, value, onChange }: { label: string; options: SegmentedOption<T>[]; value: T | null; onChange: (value: T) => void }) {
  const theme = useTheme();
  return (
    <View style={styles.wrap}>
      <Text variant="label">{label}</Text>
      <View style={styles.row} role="radiogroup" aria-label={label}>
        {options.map((o) => {
          const selected = o.value === value;
          return (
            <Pressable
              key={o.value}
              role="radio"
              aria-checked={selected}
              accessibilityLabel={o.label}
              onPress={() => onChange(o.value)}
              style={[
                styles.option,
                { borderColor: selected ? theme.colors.primary : theme.colors.border, backgroundColor: selected ? theme.colors.primarySoft : theme.colors.surface },
              ]}
            >
              <Text variant="label" style={{ color: selected ? theme.colors.primary : theme.colors.text }}>
                {selected ? '● ' : '○ '}
                {o.label}
              </Text>
            </Pressable>
          );
        })}
      </View>
    </View>
  );
}

const styles = StyleSheet.create({
  wrap: { gap: 6 },
  row: { flexDirection: 'row', flexWrap: 'wrap', gap: 8 },
  option: { minHeight: TOUCH_TARGET, paddingHorizontal: 14, borderRadius: 10, borderWidth: 2, justifyContent: 'center' },
});
