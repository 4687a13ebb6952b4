import { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { formatMinutes, formatPercent } from '@/shared/reports';
import { useUser } from '@/components/auth/auth-provider';
import { useReportQuery } from '@/components/queries/reports';
import { useReviewQueueQuery } from '@/components/queries/review';
import { DateRange, isDate } from '@/components/review/date-range';
import { localDay } from '@/components/review/format';
import { Card } from '@/components/ui/card';
import { Screen } from '@/components/ui/screen';
import { Segmented } from '@/components/ui/segmented';
import { ErrorState, LoadingState } from '@/components/ui/state-view';
import { Text } from '@/components/ui/text';
import { ExportButtons } from './export-buttons';
import { OnTimeChart } from './on-time-chart';
import { AdmissionMeasureCard, CompareCard, MEDIAN_NOTE, NurseSummaryCard, TrendsCard } from './more-reports';
import { ReportTableCard } from './report-table';

/** On-time checks, gap rate, response times and skin-to-skin deviation for one unit and a date range. */
export function ReportsScreen() {
  const user = useUser();
  // The charge nurse sees the admission-temperature measure only (the rest is the educator's).
  if (user.role === 'charge') return <AdmissionMeasureScreen />;
  return <EducatorReports />;
}

function AdmissionMeasureScreen() {
  const user = useUser();
  const [unitId, setUnitId] = useState<string | null>(user.unitIds[0] ?? null);
  const [range, setRange] = useState({ from: localDay(-90), to: localDay(0) });
  const datesOk = isDate(range.from) && isDate(range.to);
  const valid = datesOk && range.from <= range.to;
  const timeZone = user.units.find((u) => u.id === unitId)?.timeZone ?? 'UTC';
  return (
    <Screen title="Admission temperature" subtitle="Infants born before 32 weeks" wide>
      <Card>
        {user.units.length > 1 ? <Segmented label="Unit" value={unitId} onChange={setUnitId} options={user.units.map((u) => ({ value: u.id, label: u.name }))} /> : null}
        <DateRange
          from={range.from}
          to={range.to}
          onChange={setRange}
          error={!datesOk ? 'Use dates as YYYY-MM-DD.' : valid ? undefined : 'The end date must not be before the start date.'}
        />
      </Card>
      {unitId && valid ? <AdmissionMeasureCard unitId={unitId} from={range.from} to={range.to} timeZone={timeZone} /> : null}
    </Screen>
  );
}

function EducatorReports() {
  const user = useUser();
  const units = useReviewQueueQuery({ status: 'all', from: '2999-01-01' }).data?.units ?? [];
  const [chosenUnit, setUnitId] = useState<string | null>(user.unitIds[0] ?? null);
  // Until one is chosen, the first unit the queue names.
  const unitId = chosenUnit ?? units[0]?.id ?? null;
  const [range, setRange] = useState({ from: localDay(-7), to: localDay(0) });
  const datesOk = isDate(range.from) && isDate(range.to);
  const valid = datesOk && range.from <= range.to;
  const rangeError = !datesOk ? 'Use dates as YYYY-MM-DD.' : valid ? undefined : 'The end date must not be before the start date.';
  const timeZone = user.units.find((u) => u.id === unitId)?.timeZone ?? 'UTC';
  const query = useReportQuery(valid ? unitId : null, range.from, range.to);
  const data = query.data;
  return (
    <Screen title="Reports" subtitle="On-time checks and response times" wide>
      <Card>
        {units.length > 1 ? <Segmented label="Unit" value={unitId} onChange={setUnitId} options={units.map((u) => ({ value: u.id, label: u.name }))} /> : null}
        <DateRange from={range.from} to={range.to} onChange={setRange} error={rangeError} />
      </Card>
      {unitId && valid ? (
        <Card>
          <ExportButtons label="Export this unit and date range" scope={{ unitId, from: range.from, to: range.to }} />
        </Card>
      ) : null}
      {query.error ? (
        <ErrorState error={query.error} onRetry={() => void query.refetch()} />
      ) : !data ? (
        <LoadingState label="Working out the figures…" />
      ) : (
        <>
          <View style={styles.figures}>
            <Figure
              label="On-time remote-site checks"
              value={formatPercent(data.report.onTime.overall.rate)}
              detail={`${data.report.onTime.overall.onTime} of ${data.report.onTime.overall.checks}`}
            />
            <Figure
              label="Gap flags per 100 checks"
              value={data.report.gapRate.per100 === null ? '—' : data.report.gapRate.per100.toFixed(1)}
              detail={`${data.report.gapRate.gapFlags} gap flags`}
            />
            <Figure
              label="Flag to first action (median / 90th)"
              value={`${formatMinutes(data.report.responseTimes[0]!.toFirstAction.medianMinutes)} / ${formatMinutes(data.report.responseTimes[0]!.toFirstAction.p90Minutes)}`}
              detail="median: mean of the two middle values for an even count; 90th: nearest rank"
            />
            <Figure
              label="Skin-to-skin time with a deviation"
              value={formatPercent(data.report.skinToSkin.share)}
              detail={`${Math.round(data.report.skinToSkin.sessionMinutes)} min of sessions`}
            />
          </View>
          <Card>
            <OnTimeChart title="On time by shift" rows={data.report.onTime.byShift.map((r) => ({ ...r, label: r.shift === 'day' ? 'Day' : 'Night' }))} />
            <OnTimeChart title="On time by day" rows={data.report.onTime.byDay.map((r) => ({ ...r, label: r.date.slice(5) }))} />
          </Card>
          {data.tables.map((t) => (
            <ReportTableCard key={t.name} table={t} fileSuffix={`${range.from}-${range.to}`} />
          ))}
          <Text variant="caption" tone="muted">
            A check is on time when taken no later than the unit&apos;s check interval after the one before it (or admission). {MEDIAN_NOTE}
          </Text>
          {unitId ? (
            <>
              <TrendsCard unitId={unitId} from={range.from} to={range.to} />
              <CompareCard unitId={unitId} from={range.from} to={range.to} />
              <NurseSummaryCard unitId={unitId} from={range.from} to={range.to} />
              <AdmissionMeasureCard unitId={unitId} from={range.from} to={range.to} timeZone={timeZone} />
            </>
          ) : null}
        </>
      )}
    </Screen>
  );
}

function Figure({ label, value, detail }: { label: string; value: string; detail: string }) {
  return (
    <Card style={styles.figure}>
      <Text variant="caption" tone="muted">
        {label}
      </Text>
      <Text variant="title">{value}</Text>
      <Text variant="caption" tone="muted">
        {detail}
      </Text>
    </Card>
  );
}

const styles = StyleSheet.create({
  figures: { flexDirection: 'row', flexWrap: 'wrap', gap: 12 },
  figure: { flexGrow: 1, minWidth: 200 },
});
