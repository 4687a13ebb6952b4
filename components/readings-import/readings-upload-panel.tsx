import { useState } from 'react';
import { Pressable, StyleSheet, View } from 'react-native';
import { CSV_BOM } from '@/shared/csv';
import type { UploadPreview, UploadRowPreview } from '@/shared/types/admin';
import { FilePicker } from '@/components/admin-users/file-picker';
import { apiFile, problemOf } from '@/components/api/client';
import { saveTextFile } from '@/components/downloads/save-text-file';
import { readingsErrorsPath, useReadingsImportMutation, useReadingsPreviewMutation } from '@/components/queries/readings-import';
import { useTheme } from '@/components/theme/theme-provider';
import { TOUCH_TARGET } from '@/components/theme/theme';
import { Button } from '@/components/ui/button';
import { Text } from '@/components/ui/text';

/**
 * Pick a readings CSV, see every row checked, confirm each unusual row on its own (there is
 * no "confirm all"), then import. Refused rows can be saved as a CSV to fix the file.
 */
export function ReadingsUploadPanel({ unitId }: { unitId: string }) {
  const preview = useReadingsPreviewMutation(unitId);
  const importer = useReadingsImportMutation();
  const [result, setResult] = useState<UploadPreview | null>(null);
  const [confirmed, setConfirmed] = useState<Set<number>>(new Set());
  const [message, setMessage] = useState<string | null>(null);
  const [error, setError] = useState<string | null>(null);

  const pick = async (file: File) => {
    setError(null);
    setMessage(null);
    setResult(null);
    setConfirmed(new Set());
    const form = new FormData();
    form.append('file', file, file.name);
    try {
      setResult(await preview.mutateAsync(form));
    } catch (err) {
      const p = problemOf(err);
      setError(p.kind === 'invalid' ? (p.fields.file ?? p.message) : p.message);
    }
  };
  const runImport = async () => {
    if (!result) return;
    setError(null);
    try {
      const r = await importer.mutateAsync({ uploadId: result.upload.id, confirmedLines: [...confirmed] });
      setMessage(r.alreadyImported ? 'This file was imported before: nothing changed.' : `Imported: ${r.created} created, ${r.skipped} skipped.`);
    } catch (err) {
      const p = problemOf(err);
      setError(p.kind === 'invalid' ? (p.fields.confirmedLines ?? p.fields.file ?? p.message) : p.message);
    }
  };
  const saveErrors = async () => {
    if (!result) return;
    try {
      const { text, filename } = await apiFile(readingsErrorsPath(result.upload.id));
      saveTextFile(filename ?? 'readings-errors.csv', text.startsWith(CSV_BOM) ? text : CSV_BOM + text);
    } catch (err) {
      setError(problemOf(err).message);
    }
  };
  const toConfirm = result?.toConfirm ?? [];
  const unconfirmed = toConfirm.filter((l) => !confirmed.has(l)).length;
  const toggle = (line: number) => {
    const next = new Set(confirmed);
    if (next.has(line)) next.delete(line);
    else next.add(line);
    setConfirmed(next);
  };

  return (
    <View style={styles.wrap}>
      <FilePicker label="Readings CSV" onPick={(f) => void pick(f)} />
      {preview.isPending ? <Text role="status">Checking the file…</Text> : null}
      {error ? (
        <Text tone="danger" role="alert">
          {error}
        </Text>
      ) : null}
      {result ? (
        <View style={styles.wrap}>
          <Text variant="bodyStrong">
            {result.upload.filename}: {result.rows.length} rows · {result.toCreate} to import · {toConfirm.length} to confirm · {result.errorCount} with errors
            {result.alreadyImported ? ' · imported before' : ''}
          </Text>
          {result.errorCount ? <Button label="Download the refused rows (CSV)" icon="list" variant="secondary" onPress={() => void saveErrors()} /> : null}
          {result.rows
            .filter((r) => r.action === 'error' || r.action === 'skip')
            .slice(0, 100)
            .map((r) => (
              <Text key={r.line} tone={r.action === 'error' ? 'danger' : 'muted'} variant="caption">
                Line {r.line}: {r.action === 'error' ? r.errors.join('; ') : r.note}
              </Text>
            ))}
          {toConfirm.length ? (
            <View style={styles.wrap} role="group" aria-label="Unusual values to confirm">
              <Text variant="label">Unusual values: check each against the source record, then confirm it</Text>
              {result.rows
                .filter((r) => r.action === 'create' && r.unusual?.length)
                .map((r) => (
                  <ConfirmRow key={r.line} row={r} checked={confirmed.has(r.line)} onToggle={() => toggle(r.line)} />
                ))}
            </View>
          ) : null}
          {!message ? (
            <Button
              label={
                result.errorCount
                  ? 'Fix the errors, then upload again'
                  : unconfirmed
                    ? `Confirm ${unconfirmed} more row${unconfirmed > 1 ? 's' : ''} to import`
                    : `Import ${result.toCreate} rows`
              }
              disabled={result.errorCount > 0 || result.toCreate === 0 || unconfirmed > 0 || importer.isPending}
              onPress={() => void runImport()}
            />
          ) : null}
          {importer.isPending ? <Text role="status">Importing…</Text> : null}
          {message ? (
            <Text tone="ok" role="status">
              {message}
            </Text>
          ) : null}
        </View>
      ) : null}
    </View>
  );
}

function ConfirmRow({ row, checked, onToggle }: { row: UploadRowPreview; checked: boolean; onToggle: () => void }) {
  const theme = useTheme();
  const label = `Line ${row.line} (${row.values.infant ?? ''} ${row.values.time ?? ''}): ${(row.unusual ?? []).join('; ')}`;
  return (
    <Pressable
      role="checkbox"
      aria-checked={checked}
      accessibilityLabel={`Confirm line ${row.line}`}
      onPress={onToggle}
      style={[styles.confirm, { borderColor: checked ? theme.colors.primary : theme.colors.border, backgroundColor: theme.colors.surface }]}
    >
      <Text variant="bodyStrong" tone={checked ? 'ok' : 'muted'}>
        {checked ? 'Confirmed' : 'Confirm'}
      </Text>
      <Text style={styles.confirmText}>{label}</Text>
    </Pressable>
  );
}

const styles = StyleSheet.create({
  wrap: { gap: 8 },
  confirm: { flexDirection: 'row', gap: 10, alignItems: 'center', minHeight: TOUCH_TARGET, borderWidth: 2, borderRadius: 10, padding: 10 },
  confirmText: { flexShrink: 1 },
});
