import { useState } from 'react';
import { READINGS_EXAMPLE } from '@/shared/uploads/example';
import { UploadPanel } from '../admin-users/upload-panel';
import { useUser } from '../auth/auth-provider';
import { Card } from '../ui/card';
import { Screen } from '../ui/screen';
import { Segmented } from '../ui/segmented';
import { Text } from '../ui/text';

/** The charge nurse imports readings from a CSV file in Warmfold's own format. */
export function ReadingsImportScreen() {
  const user = useUser();
  const [unitId, setUnitId] = useState(user.unitIds[0] ?? '');
  return (
    <Screen title="Import readings" subtitle="From a CSV file, checked row by row before anything is charted">
      {user.unitIds.length > 1 ? <Segmented label="Unit" value={unitId} onChange={setUnitId} options={(user.units ?? user.unitIds.map((id) => ({ id, name: id }))).map((u) => ({ value: u.id, label: u.name }))} /> : null}
      <Card>
        <Text variant="title" role="heading" aria-level={2}>
          The format
        </Text>
        <Text>One reading per row, with a header row. Columns:</Text>
        <Text>• infant: the bed label (N01) or infant id · time: ISO 8601 with a zone (2026-11-16T08:00:00Z)</Text>
        <Text>• probe, remote: temperatures in the row&apos;s unit · site: axilla, rectal or other (needed with remote)</Text>
        <Text>• unit: C or F · mode: skin-servo, air-servo or manual · output: heater output 0–100 % · heart_rate: per minute</Text>
        <Text tone="muted">A row needs a probe, remote-site or heart-rate value. All rows are imported in one go or none; a file imported before imports nothing again.</Text>
        <Text variant="caption" style={{ fontFamily: 'monospace' }}>
          {READINGS_EXAMPLE}
        </Text>
      </Card>
      <Card>
        <UploadPanel key={unitId} label="Readings CSV" previewPath={`/readings-import/preview?unitId=${encodeURIComponent(unitId)}`} importPath={(id) => `/readings-import/${id}/import`} />
      </Card>
    </Screen>
  );
}
