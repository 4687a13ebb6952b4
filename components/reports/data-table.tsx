import type { ReactNode } from 'react';
import { ScrollView, StyleSheet, View } from 'react-native';
import { useTheme } from '@/components/theme/theme-provider';
import { Text } from '@/components/ui/text';

const COLUMN_MIN = 96;

/**
 * A table readable by assistive technology that never loses a column on a phone: below its
 * natural width (columns × 96 px) it scrolls sideways inside its card instead of squeezing
 * or cutting the last columns off.
 */
export function DataTable({
  label,
  header,
  rows,
  highlight,
  empty = 'No data in this range.',
}: {
  label: string;
  header: string[];
  rows: ReactNode[][];
  highlight?: (i: number) => string | undefined;
  empty?: string;
}) {
  const theme = useTheme();
  return (
    // Focusable, so a keyboard user can scroll it sideways too (axe: scrollable-region-focusable).
    <ScrollView
      horizontal
      tabIndex={0}
      accessibilityLabel={`${label} (scrolls sideways on a narrow screen)`}
      contentContainerStyle={[styles.content, { minWidth: header.length * COLUMN_MIN }]}
    >
      <View role="table" aria-label={label} style={styles.table}>
        <View role="row" style={[styles.tr, { borderBottomColor: theme.colors.border }]}>
          {header.map((h) => (
            <Text key={h} role="columnheader" variant="label" style={styles.td}>
              {h}
            </Text>
          ))}
        </View>
        {rows.length === 0 ? <Text tone="muted">{empty}</Text> : null}
        {rows.map((row, i) => (
          <View key={i} role="row" style={[styles.tr, { borderBottomColor: theme.colors.border, backgroundColor: highlight?.(i) }]}>
            {row.map((cell, j) => (
              <Text key={j} role="cell" style={styles.td}>
                {cell === null || cell === undefined ? '—' : cell}
              </Text>
            ))}
          </View>
        ))}
      </View>
    </ScrollView>
  );
}

const styles = StyleSheet.create({
  content: { flexGrow: 1 },
  table: { flex: 1 },
  tr: { flexDirection: 'row', borderBottomWidth: 1, paddingVertical: 6 },
  td: { flex: 1, minWidth: COLUMN_MIN - 8, paddingRight: 6 },
});
