import { useState } from 'react';
import { DateRange, isDate } from '@/components/review/date-range';
import { localDay } from '@/components/review/format';
import { Card } from '@/components/ui/card';
import { ExportButtons } from './export-buttons';

/** The educator's exports of one infant: readings and flags for a date range, FHIR for the range or the whole record. */
export function InfantExports({ infantId, unitId }: { infantId: string; unitId: string }) {
  const [range, setRange] = useState({ from: localDay(-30), to: localDay(0) });
  const valid = isDate(range.from) && isDate(range.to) && range.from <= range.to;
  return (
    <Card>
      <DateRange from={range.from} to={range.to} onChange={setRange} error={valid ? undefined : 'Use dates as YYYY-MM-DD, the end not before the start.'} />
      <ExportButtons label="Export this infant" scope={{ unitId, infantId, ...(valid ? { from: range.from, to: range.to } : {}) }} />
    </Card>
  );
}
