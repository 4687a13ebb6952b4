import { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import type { UploadPreview } from '@/shared/types/admin';
import { problemOf } from '@/components/api/client';
import { useUploadImportMutation, useUploadPreviewMutation } from '@/components/queries/admin';
import { useTheme } from '@/components/theme/theme-provider';
import { Button } from '@/components/ui/button';
import { Text } from '@/components/ui/text';
import { FilePicker } from './file-picker';

type Stage = 'idle' | 'uploading' | 'previewed' | 'importing' | 'done';

/** Pick a CSV, see every row checked, then import; a bar shows where it is. */
export function UploadPanel({ label, previewPath, importPath }: { label: string; previewPath: string; importPath: (uploadId: string) => string }) {
  const theme = useTheme();
  const preview = useUploadPreviewMutation(previewPath);
  const importer = useUploadImportMutation(importPath);
  const [stage, setStage] = useState<Stage>('idle');
  const [result, setResult] = useState<UploadPreview | null>(null);
  const [message, setMessage] = useState<string | null>(null);
  const [error, setError] = useState<string | null>(null);

  const pick = async (file: File) => {
    setError(null);
    setMessage(null);
    setStage('uploading');
    const form = new FormData();
    form.append('file', file, file.name);
    try {
      setResult(await preview.mutateAsync(form));
      setStage('previewed');
    } catch (err) {
      const p = problemOf(err);
      setError(p.kind === 'invalid' ? (p.fields.file ?? p.message) : p.message);
      setStage('idle');
    }
  };
  const runImport = async () => {
    if (!result) return;
    setStage('importing');
    try {
      const r = await importer.mutateAsync(result.upload.id);
      setMessage(r.alreadyImported ? 'This file was imported before: nothing changed.' : `Imported: ${r.created} created, ${r.skipped} skipped.`);
      setStage('done');
    } catch (err) {
      const p = problemOf(err);
      setError(p.kind === 'invalid' ? (p.fields.file ?? p.message) : p.message);
      setStage('previewed');
    }
  };
  const progress = { idle: 0, uploading: 0.3, previewed: 0.5, importing: 0.8, done: 1 }[stage];

  return (
    <View style={styles.wrap}>
      <FilePicker label={label} onPick={(f) => void pick(f)} />
      <View
        role="progressbar"
        aria-label={`${label} progress`}
        aria-valuemin={0}
        aria-valuemax={100}
        aria-valuenow={Math.round(progress * 100)}
        style={[styles.track, { backgroundColor: theme.colors.surfaceSunken }]}
      >
        <View style={[styles.bar, { width: `${progress * 100}%`, backgroundColor: theme.colors.primary }]} />
      </View>
      {error ? (
        <Text tone="danger" role="alert">
          {error}
        </Text>
      ) : null}
      {result && stage !== 'idle' ? (
        <View style={styles.wrap}>
          <Text variant="bodyStrong">
            {result.upload.filename}: {result.rows.length} rows · {result.toCreate} to import · {result.errorCount} with errors
            {result.alreadyImported ? ' · imported before' : ''}
          </Text>
          {result.rows
            .filter((r) => r.action !== 'create')
            .slice(0, 50)
            .map((r) => (
              <Text key={r.line} tone={r.action === 'error' ? 'danger' : 'muted'} variant="caption">
                Line {r.line}: {r.action === 'error' ? r.errors.join('; ') : r.note}
              </Text>
            ))}
          {stage === 'previewed' ? (
            <Button
              label={result.errorCount ? 'Fix the errors, then upload again' : `Import ${result.toCreate} rows`}
              disabled={result.errorCount > 0 || result.toCreate === 0}
              onPress={() => void runImport()}
            />
          ) : null}
          {stage === 'importing' ? <Text role="status">Importing…</Text> : null}
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

const styles = StyleSheet.create({
  wrap: { gap: 8 },
  track: { height: 8, borderRadius: 4, overflow: 'hidden' },
  bar: { height: 8 },
});
