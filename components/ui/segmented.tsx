import { useRef } from 'react';
import { Platform, Pressable, StyleSheet, View } from 'react-native';
import { TOUCH_TARGET } from '@/components/theme/theme';
import { useTheme } from '@/components/theme/theme-provider';
import { Text } from './text';

export interface SegmentedOption<T extends string> {
  value: T;
  label: string;
}

const NEXT_KEYS = new Set(['ArrowRight', 'ArrowDown']);
const PREVIOUS_KEYS = new Set(['ArrowLeft', 'ArrowUp']);

/**
 * A small set of choices, one chosen: a radio group to assistive technology and to the keyboard
 * (WAI-ARIA radio group): Tab reaches the group once, at the chosen option, and the arrow keys
 * move the choice, so a form with several groups is not a long walk of Tab presses.
 */
export function Segmented<T extends string>({ label, options, value, onChange }: { label: string; options: SegmentedOption<T>[]; value: T | null; onChange: (value: T) => void }) {
  const theme = useTheme();
  const refs = useRef<(View | null)[]>([]);
  const chosen = options.findIndex((o) => o.value === value);
  const tabStop = chosen === -1 ? 0 : chosen;

  const move = (from: number, step: 1 | -1) => {
    const to = (from + step + options.length) % options.length;
    onChange(options[to]!.value);
    (refs.current[to] as unknown as { focus?: () => void } | null)?.focus?.();
  };
  // Web only: React Native's types have no key events on Pressable; react-native-web passes them on.
  const keyHandler = (index: number) => ({
    onKeyDown: (e: { key: string; preventDefault: () => void }) => {
      if (NEXT_KEYS.has(e.key)) move(index, 1);
      else if (PREVIOUS_KEYS.has(e.key)) move(index, -1);
      else return;
      e.preventDefault();
    },
  });

  return (
    <View style={styles.wrap}>
      <Text variant="label">{label}</Text>
      <View style={styles.row} role="radiogroup" aria-label={label}>
        {options.map((o, index) => {
          const selected = o.value === value;
          return (
            <Pressable
              key={o.value}
              ref={(node) => {
                refs.current[index] = node;
              }}
              role="radio"
              aria-checked={selected}
              accessibilityLabel={o.label}
              tabIndex={index === tabStop ? 0 : -1}
              onPress={() => onChange(o.value)}
              {...(Platform.OS === 'web' ? (keyHandler(index) as object) : {})}
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
