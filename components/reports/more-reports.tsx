import { useState } from 'react';
import { View, StyleSheet } from 'react-native';
import { formatMinutes, formatPercent, MEDIAN_WORDS } from '@/shared/reports';
import { NORMAL_MAX_CENTI, NORMAL_MIN_CENTI } from '@/shared/thermal/bands';
import type { TempUnit } from '@/shared/thermal/units';
import type { CompareResponse, NurseSummaryResponse, PeriodFigures, TrendResponse } from '@/shared/types/review';
import { useUser } from '@/components/auth/auth-provider';
import { useReportPartQuery } from '@/components/queries/reports';
import { formatDayTime } from '@/components/ui/format-time';
import { temp } from '@/components/review/format';
import { Card } from '@/components/ui/card';
import { Segmented } from '@/components/ui/segmented';
import { ErrorState, LoadingState } from '@/components/ui/state-view';
import { Text } from '@/components/ui/text';
import { DataTable } from './data-table';

const FIGURE_HEADER = ['Period', 'Checks', 'On time', 'Flags', 'Gap flags / 100 checks', 'Median to first action', 'Median to resolution'];

function figureRow(p: PeriodFigures) {
  return [
    p.label,
    String(p.checks),
    formatPercent(p.onTimeRate),
    String(p.flags),
    p.gapPer100 === null ? '—' : p.gapPer100.toFixed(1),
    formatMinutes(p.medianMinutesToAction),
    formatMinutes(p.medianMinutesToResolution),
  ];
}

function Section({ title, children }: { title: string; children: React.ReactNode }) {
  return (
    <Card>
      <Text variant="title" role="heading" aria-level={2}>
        {title}
      </Text>
      {children}
    </Card>
  );
}

function Loading<T>({ query, label, children }: { query: { error: unknown; data: T | undefined; refetch: () => unknown }; label: string; children: (data: T) => React.ReactNode }) {
  if (query.error) return <ErrorState error={query.error} onRetry={() => void query.refetch()} />;
  if (!query.data) return <LoadingState label={label} />;
  return <>{children(query.data)}</>;
}

/** The unit's figures week by week or month by month over the chosen range. */
export function TrendsCard({ unitId, from, to }: { unitId: string; from: string; to: string }) {
  const [by, setBy] = useState<'week' | 'month'>('week');
  const query = useReportPartQuery<TrendResponse>('/reports/trends', { unitId, from, to, by }, true);
  return (
    <Section title="Trends">
      <Segmented
        label="By"
        value={by}
        onChange={setBy}
        options={[
          { value: 'week', label: 'Week (Mon–Sun)' },
          { value: 'month', label: 'Month' },
        ]}
      />
      <Loading query={query} label="Working out the trends…">
        {(d) => <DataTable label={`Trends by ${by}`} header={FIGURE_HEADER} rows={d.periods.map(figureRow)} />}
      </Loading>
    </Section>
  );
}

/** YYYY-MM-DD, `days` before `date`. */
function daysBefore(date: string, days: number): string {
  const ms = Date.parse(`${date}T00:00:00Z`) - days * 86_400_000;
  return new Date(ms).toISOString().slice(0, 10);
}

/** The chosen range beside the same number of days just before it. */
export function CompareCard({ unitId, from, to }: { unitId: string; from: string; to: string }) {
  const length = Math.round((Date.parse(to) - Date.parse(from)) / 86_400_000) + 1;
  const bFrom = from;
  const aTo = daysBefore(from, 1);
  const aFrom = daysBefore(from, length);
  const query = useReportPartQuery<CompareResponse>('/reports/compare', { unitId, aFrom, aTo, bFrom, bTo: to }, true);
  return (
    <Section title="This range against the one before">
      <Loading query={query} label="Comparing the two periods…">
        {(d) => <DataTable label="Comparison of two periods" header={FIGURE_HEADER} rows={[figureRow(d.a), figureRow(d.b)]} />}
      </Loading>
    </Section>
  );
}

/** Per nurse concerned: flags, review outcomes, median minutes to first action. */
export function NurseSummaryCard({ unitId, from, to }: { unitId: string; from: string; to: string }) {
  const query = useReportPartQuery<NurseSummaryResponse>('/review/nurses', { unitId, from, to }, true);
  return (
    <Section title="By nurse">
      <Loading query={query} label="Working out the figures by nurse…">
        {(d) => (
          <>
            <DataTable
              label="Flags and reviews by nurse"
              header={['Nurse', 'Flags', 'Noted', 'Read by the nurse', 'No teaching point', 'To review', 'Median to first action']}
              rows={d.nurses.map((n) => [
                n.nurse.name,
                String(n.flags),
                String(n.noted),
                String(n.acknowledged),
                String(n.noTeachingPoint),
                String(n.unreviewed),
                formatMinutes(n.medianMinutesToAction),
              ])}
              empty="No flags in this range."
            />
            {d.withoutNurse ? (
              <Text variant="caption" tone="muted">{`${d.withoutNurse} flag${d.withoutNurse === 1 ? '' : 's'} from imported readings that named no nurse.`}</Text>
            ) : null}
          </>
        )}
      </Loading>
    </Section>
  );
}

interface MeasureAnswer {
  measure: {
    eligible: number;
    met: number;
    rate: number | null;
    byMonth: { month: string; eligible: number; met: number; rate: number | null }[];
    missed: {
      infantId: string;
      displayName: string;
      hospitalNumber: string | null;
      birthAt: string;
      gestationWeeks: number;
      gestationDays: number;
      first: { takenAt: string; centi: number; site: string; minutesAfterBirth: number } | null;
      reasons: string[];
    }[];
  };
}

/** Why an infant missed the measure, with the limits in the viewer's unit. */
function reasonWords(reason: string, unit: TempUnit): string {
  if (reason === 'too-cold') return `too cold (below ${temp(NORMAL_MIN_CENTI, unit)})`;
  if (reason === 'too-warm') return `too warm (above ${temp(NORMAL_MAX_CENTI, unit)})`;
  if (reason === 'too-late') return 'later than one hour after birth';
  if (reason === 'none-recorded') return 'no axillary or rectal temperature recorded';
  return reason;
}

/** The admission-temperature measure for infants born before 32 weeks, by month, and who missed it and why. */
export function AdmissionMeasureCard({ unitId, from, to, timeZone }: { unitId: string; from: string; to: string; timeZone: string }) {
  const user = useUser();
  const query = useReportPartQuery<MeasureAnswer>('/reports/admission-measure', { unitId, from, to }, true);
  return (
    <Section title="Temperature on admission, born before 32 weeks">
      <Text variant="caption" tone="muted">
        The share whose first axillary or rectal temperature (never the skin probe) was {temp(NORMAL_MIN_CENTI, user.tempUnit)} to {temp(NORMAL_MAX_CENTI, user.tempUnit)} and taken
        within one hour of birth (UK National Neonatal Audit Programme measure), by month of admission.
      </Text>
      <Loading query={query} label="Working out the admission measure…">
        {({ measure: m }) => (
          <View style={styles.stack}>
            <Text variant="bodyStrong">{`${formatPercent(m.rate)} (${m.met} of ${m.eligible})`}</Text>
            <DataTable
              label="Admission measure by month"
              header={['Month', 'Infants', 'Met', 'Share']}
              rows={m.byMonth.map((r) => [r.month, String(r.eligible), String(r.met), formatPercent(r.rate)])}
              empty="No infant born before 32 weeks was admitted in this range."
            />
            {m.missed.length ? (
              <DataTable
                label="Infants that missed the measure"
                header={['Infant', 'Gestation', 'Born', 'First temperature', 'Why']}
                rows={m.missed.map((i) => [
                  `${i.displayName}${i.hospitalNumber ? ` (${i.hospitalNumber})` : ''}`,
                  `${i.gestationWeeks}+${i.gestationDays}`,
                  formatDayTime(i.birthAt, timeZone, user.clock),
                  i.first ? `${temp(i.first.centi, user.tempUnit)} ${i.first.site}, ${i.first.minutesAfterBirth} min after birth` : '—',
                  i.reasons.map((r) => reasonWords(r, user.tempUnit)).join('; '),
                ])}
              />
            ) : null}
          </View>
        )}
      </Loading>
    </Section>
  );
}

/** How the report's median is worked out, said on screen. */
export const MEDIAN_NOTE = `Medians are the ${MEDIAN_WORDS}, as a spreadsheet's MEDIAN; 90th percentiles use the nearest-rank method (the value at rank ⌈0.9 × n⌉).`;

const styles = StyleSheet.create({ stack: { gap: 8 } });
