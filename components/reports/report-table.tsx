import { StyleSheet, View } from 'react-native';
import { toCsv } from '@/shared/csv';
import type { ReportTable as Table } from '@/shared/reports';
import { saveTextFile } from '../downloads/save-text-file';
import { useTheme } from '../theme/theme-provider';
import { Button } from '../ui/button';
import { Card } from '../ui/card';
import { Text } from '../ui/text';

/** One report table, readable as a table by assistive technology, with its own CSV export. */
export function ReportTableCard({ table, fileSuffix }: { table: Table; fileSuffix: string }) {
  const theme = useTheme();
  return (
    <Card>
      <View style={styles.head}>
        <Text variant="title" role="heading" aria-level={2} style={styles.title}>
          {table.title}
        </Text>
        <Button label={`CSV: ${table.title}`} icon="list" variant="quiet" compact onPress={() => saveTextFile(`${table.name}-${fileSuffix}.csv`, toCsv(table.header, table.rows))} />
      </View>
      <View role="table" aria-label={table.title}>
        <View role="row" style={[styles.tr, { borderBottomColor: theme.colors.border }]}>
          {table.header.map((h) => (
            <Text key={h} role="columnheader" variant="label" style={styles.td}>
              {h.replace(/_/g, ' ')}
            </Text>
          ))}
        </View>
        {table.rows.length === 0 ? <Text tone="muted">No data in this range.</Text> : null}
        {table.rows.map((row, i) => (
          <View key={i} role="row" style={[styles.tr, { borderBottomColor: theme.colors.border }]}>
            {row.map((cell, j) => (
              <Text key={j} role="cell" style={styles.td}>
                {cell === null ? '—' : String(cell)}
              </Text>
            ))}
          </View>
        ))}
      </View>
    </Card>
  );
}

const styles = StyleSheet.create({
  head: { flexDirection: 'row', flexWrap: 'wrap', justifyContent: 'space-between', alignItems: 'center', gap: 8 },
  title: { flexShrink: 1 },
  tr: { flexDirection: 'row', borderBottomWidth: 1, paddingVertical: 6 },
  td: { flex: 1, minWidth: 64, paddingRight: 6 },
});
