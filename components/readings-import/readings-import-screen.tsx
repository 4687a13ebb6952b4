import { useState } from 'react';
import { READINGS_EXAMPLE } from '@/shared/uploads/example';
import { useUser } from '@/components/auth/auth-provider';
import { Card } from '@/components/ui/card';
import { Screen } from '@/components/ui/screen';
import { Segmented } from '@/components/ui/segmented';
import { Text } from '@/components/ui/text';
import { ReadingsUploadPanel } from './readings-upload-panel';

/** The charge nurse imports readings from a CSV file in Warmfold's own format. */
export function ReadingsImportScreen() {
  const user = useUser();
  const [unitId, setUnitId] = useState(user.unitIds[0] ?? '');
  return (
    <Screen title="Import readings" subtitle="From a CSV file, checked row by row before anything is charted">
      {user.unitIds.length > 1 ? (
        <Segmented
          label="Unit"
          value={unitId}
          onChange={setUnitId}
          options={(user.units ?? user.unitIds.map((id) => ({ id, name: id }))).map((u) => ({ value: u.id, label: u.name }))}
        />
      ) : null}
      <Card>
        <Text variant="title" role="heading" aria-level={2}>
          The format
        </Text>
        <Text>One reading per row, with a header row. Columns:</Text>
        <Text>• infant: the bed label (N01) or infant id</Text>
        <Text>
          • time: 2026-11-16T08:00 is read as the unit&apos;s local time; a time with an offset (2026-11-16T08:00:00Z, 2026-11-16T09:00+01:00) is that instant. A local time the
          clocks skip or pass twice is refused: give its offset. Dates must exist (no 31 November).
        </Text>
        <Text>• probe, remote, air, set: temperatures in the row&apos;s unit · site: axilla, rectal or other (needed with remote)</Text>
        <Text>• unit: C or F · mode: skin-servo, air-servo or manual · output: heater output 0–100 % · heart_rate: per minute</Text>
        <Text>• taken_by: the e-mail of the nurse of this unit who took the reading. A row without it is credited to you as importer, never to a nurse.</Text>
        <Text tone="muted">
          UTF-8 text (with or without a byte-order mark), comma- or semicolon-separated, one row per line, at most 1 MB. A row needs a probe, remote-site or heart-rate value. A
          value outside its usual range is imported only after you confirm that row. All rows are imported in one go or none; a file imported before imports nothing again.
        </Text>
        <Text variant="caption" style={{ fontFamily: 'monospace' }}>
          {READINGS_EXAMPLE}
        </Text>
      </Card>
      <Card>
        <ReadingsUploadPanel key={unitId} unitId={unitId} />
      </Card>
    </Screen>
  );
}
