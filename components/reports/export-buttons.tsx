import { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { CSV_BOM } from '@/shared/csv';
import { apiFile, problemOf } from '@/components/api/client';
import { saveTextFile } from '@/components/downloads/save-text-file';
import { queryString } from '@/components/queries/review';
import { Button } from '@/components/ui/button';
import { Text } from '@/components/ui/text';

export interface ExportScope {
  /** Readings and FHIR need a unit; the flags CSV without one covers all the user's units. */
  unitId?: string | null;
  /** Local dates, YYYY-MM-DD; both or neither. */
  from?: string;
  to?: string;
  infantId?: string;
  /** More filters for the flags CSV (the review queue's shift, kind, nurse, status, search). */
  flagFilters?: Record<string, string | undefined>;
}

type Kind = 'readings' | 'flags' | 'fhir';

/** The three exports' paths for a scope: readings and FHIR need a date range unless one infant's whole record is wanted. */
export function exportPaths(scope: ExportScope): Record<Kind, string | null> {
  const range = scope.unitId && scope.from && scope.to ? { unitId: scope.unitId, from: scope.from, to: scope.to, infantId: scope.infantId } : null;
  return {
    readings: range ? `/exports/readings.csv${queryString(range)}` : null,
    flags: `/exports/flags.csv${queryString({ status: 'all', ...scope.flagFilters, unitId: scope.unitId, from: scope.from, to: scope.to, infantId: scope.infantId })}`,
    fhir: range ? `/exports/fhir${queryString(range)}` : scope.infantId ? `/exports/infants/${encodeURIComponent(scope.infantId)}/fhir` : null,
  };
}

const LABELS: Record<Kind, string> = { readings: 'Readings CSV', flags: 'Flags CSV (with teaching notes)', fhir: 'FHIR R4 (JSON)' };

/** Buttons that download the readings, the flags and the FHIR Bundle for a unit and date range, or for one infant. */
export function ExportButtons({ scope, label = 'Export' }: { scope: ExportScope; label?: string }) {
  const [busy, setBusy] = useState<Kind | null>(null);
  const [message, setMessage] = useState<{ tone: 'ok' | 'danger'; text: string } | null>(null);
  const paths = exportPaths(scope);
  const download = async (kind: Kind) => {
    const path = paths[kind];
    if (!path) return;
    setBusy(kind);
    setMessage(null);
    try {
      const { text, filename } = await apiFile(path);
      const name = filename ?? `${kind}.${kind === 'fhir' ? 'json' : 'csv'}`;
      // The browser's text() drops the byte-order mark; put it back so a spreadsheet reads UTF-8.
      if (kind === 'fhir') saveTextFile(name, text, 'application/fhir+json');
      else saveTextFile(name, text.startsWith(CSV_BOM) ? text : CSV_BOM + text);
      setMessage({ tone: 'ok', text: `Saved ${name}.` });
    } catch (err) {
      setMessage({ tone: 'danger', text: problemOf(err).message });
    } finally {
      setBusy(null);
    }
  };
  return (
    <View style={styles.wrap} role="group" aria-label={label}>
      <Text variant="label">{label}</Text>
      <View style={styles.row}>
        {(Object.keys(LABELS) as Kind[]).map((kind) => (
          <Button
            key={kind}
            label={busy === kind ? 'Preparing…' : LABELS[kind]}
            icon="list"
            variant="secondary"
            disabled={!paths[kind] || busy !== null}
            onPress={() => void download(kind)}
          />
        ))}
      </View>
      {!paths.readings ? (
        <Text variant="caption" tone="muted">
          Choose one unit and a date range to export readings{scope.infantId ? '' : ' and FHIR'}.
        </Text>
      ) : null}
      {message ? (
        <Text variant="caption" tone={message.tone} role="status">
          {message.text}
        </Text>
      ) : null}
    </View>
  );
}

const styles = StyleSheet.create({
  wrap: { gap: 6 },
  row: { flexDirection: 'row', flexWrap: 'wrap', gap: 8 },
});
