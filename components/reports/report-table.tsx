import { StyleSheet, View } from 'react-native';
import { toCsv } from '@/shared/csv';
import type { ReportTable as Table } from '@/shared/reports';
import { saveTextFile } from '@/components/downloads/save-text-file';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { Text } from '@/components/ui/text';
import { DataTable } from './data-table';

/** One report table, readable as a table by assistive technology, with its own CSV export. */
export function ReportTableCard({ table, fileSuffix }: { table: Table; fileSuffix: string }) {
  return (
    <Card>
      <View style={styles.head}>
        <Text variant="title" role="heading" aria-level={2} style={styles.title}>
          {table.title}
        </Text>
        <Button
          label={`CSV: ${table.title}`}
          icon="list"
          variant="quiet"
          compact
          onPress={() => saveTextFile(`${table.name}-${fileSuffix}.csv`, toCsv(table.header, table.rows))}
        />
      </View>
      <DataTable
        label={table.title}
        header={table.header.map((h) => h.replace(/_/g, ' '))}
        rows={table.rows.map((row) => row.map((cell) => (cell === null ? '—' : String(cell))))}
      />
    </Card>
  );
}

const styles = StyleSheet.create({
  head: { flexDirection: 'row', flexWrap: 'wrap', justifyContent: 'space-between', alignItems: 'center', gap: 8 },
  title: { flexShrink: 1 },
});
