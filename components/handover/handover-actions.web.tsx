import { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { API_BASE } from '@/components/api/client';
import { storage } from '@/components/api/storage';
import { Button } from '@/components/ui/button';
import { Text } from '@/components/ui/text';

/** The key the auth provider keeps the session token under. */
const TOKEN_KEY = 'warmfold.token';

async function downloadCsv(infantId: string): Promise<void> {
  const token = storage.get(TOKEN_KEY);
  const res = await fetch(`${API_BASE}/api/infants/${encodeURIComponent(infantId)}/handover.csv`, { headers: token ? { Authorization: `Bearer ${token}` } : {} });
  if (!res.ok) throw new Error(`The CSV could not be made (${res.status}).`);
  const name = /filename="([^"]+)"/.exec(res.headers.get('Content-Disposition') ?? '')?.[1] ?? 'handover.csv';
  const url = URL.createObjectURL(await res.blob());
  const a = document.createElement('a');
  a.href = url;
  a.download = name;
  document.body.appendChild(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 1000);
}

export function HandoverActions({ infantIds }: { infantIds: string[] }) {
  const [error, setError] = useState<string | null>(null);
  return (
    <div data-noprint="">
      <View style={styles.row}>
        <Button label="Print" icon="print" onPress={() => window.print()} />
        {infantIds.length === 1 ? <Button label="Download CSV" variant="secondary" onPress={() => downloadCsv(infantIds[0]!).catch((e: Error) => setError(e.message))} /> : null}
        {error ? <Text tone="danger">{error}</Text> : null}
      </View>
    </div>
  );
}

const styles = StyleSheet.create({ row: { flexDirection: 'row', gap: 8, flexWrap: 'wrap', alignItems: 'center' } });
