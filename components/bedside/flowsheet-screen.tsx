import { useRouter } from 'expo-router';
import { useQueryClient } from '@tanstack/react-query';
import { Fragment, useEffect, useRef, useState } from 'react';
import { Platform, Pressable, StyleSheet, useWindowDimensions, View } from 'react-native';
import type { Flowsheet, FlowsheetReading, ReadingVersion } from '@/shared/types/bedside';
import { HEAT_STRESS_SIGN_LABELS, type HeatStressSign } from '@/shared/thermal/heat-stress';
import { useUser } from '@/components/auth/auth-provider';
import { InfantExports } from '@/components/reports/infant-exports';
import { prefetchInfant, useFlowsheetQuery } from '@/components/queries/infants';
import { useTheme } from '@/components/theme/theme-provider';
import { WIDE_BREAKPOINT } from '@/components/theme/theme';
import { afterNextPaint, useAfterFirstPaint } from '@/components/ui/after-next-paint';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { dayHeading, formatClock, formatWhen, localDayKey } from '@/components/ui/format-time';
import { Screen } from '@/components/ui/screen';
import { Segmented } from '@/components/ui/segmented';
import { ErrorState, LoadingState } from '@/components/ui/state-view';
import { StatusBadge } from '@/components/ui/status-badge';
import { Text } from '@/components/ui/text';
import { CheckClockBadges } from './check-badge';
import { ClosedFlags, FlagCard } from './flag-card';
import { CONTROL_MODE_LABELS, CORRECTION_REASON_LABELS, dayTime, SITE_LABELS, temp } from './format';
import { startPendingFlush } from './pending-readings';
import { PendingReadingCards } from './pending-reading-card';
import { SkinToSkinHistory, SkinToSkinPanel } from './skin-to-skin';
import { TrendChart } from './trend-chart';
import { useNow } from './use-now';
import { FLOWSHEET_FIRST_HOURS, type FlowsheetHours } from '@/components/api/paths';
import { openRecordForm } from './open-record-form';
import { CurrentPlacementCard } from './placement-view';
import { PLACEMENT_GRID_ROWS, readingExtras } from './placement-rows';
import { StayEndCard } from './stay-end-card';

type Hours = FlowsheetHours;

export function FlowsheetScreen({ infantId }: { infantId: string }) {
  const [hours, setHours] = useState<Hours>(FLOWSHEET_FIRST_HOURS);
  const query = useFlowsheetQuery(infantId, hours);
  const router = useRouter();
  const user = useUser();
  const canChart = user.role === 'nurse' || user.role === 'charge';
  const sheet = query.data;
  const queryClient = useQueryClient();
  useEffect(() => startPendingFlush(queryClient), [queryClient]);
  useEffect(() => (canChart ? afterNextPaint(() => void prefetchInfant(queryClient, infantId)) : undefined), [canChart, queryClient, infantId]);
  return (
    <Screen
      title={sheet ? `${sheet.infant.bedLabel ?? ''} · ${sheet.infant.displayName}` : 'Flowsheet'}
      subtitle="Flowsheet"
      refreshing={query.isRefetching}
      onRefresh={() => void query.refetch()}
      actions={canChart ? <Button label="Record" icon="plus" onPress={() => openRecordForm(router, infantId)} /> : null}
    >
      {query.isError && !sheet ? (
        <ErrorState error={query.error} onRetry={() => void query.refetch()} />
      ) : !sheet ? (
        <LoadingState label="Loading the flowsheet…" />
      ) : (
        <FlowsheetBody sheet={sheet} hours={hours} setHours={setHours} canChart={canChart} />
      )}
      {sheet && user.role === 'educator' ? <InfantExports infantId={infantId} unitId={sheet.infant.unitId} /> : null}
    </Screen>
  );
}

/** Reading cards drawn with the page on a phone; the rest, below the first screen, follow once it is painted. */
const FIRST_CARDS = 4;

function FlowsheetBody({ sheet, hours, setHours, canChart }: { sheet: Flowsheet; hours: Hours; setHours: (h: Hours) => void; canChart: boolean }) {
  const user = useUser();
  const now = useNow();
  const painted = useAfterFirstPaint();
  const { width } = useWindowDimensions();
  const wide = width >= WIDE_BREAKPOINT;
  const openFlags = sheet.flags.filter((f) => f.status === 'open');
  const corrected = [...sheet.readings.filter((r) => r.corrected), ...sheet.removed];
  const trend = useRef<View>(null);
  const cards = painted ? sheet.readings : sheet.readings.slice(0, FIRST_CARDS);
  return (
    <View style={styles.body}>
      <View style={styles.badges}>
        <CheckClockBadges checks={sheet.checks} next={sheet.nextCheck} now={now} />
        {openFlags.length === 0 ? <StatusBadge tone="ok" icon="check" label="No open flags" /> : null}
        {/* On a phone the chart is below the readings: one tap brings it up. */}
        {!wide && Platform.OS === 'web' ? (
          <Button compact variant="secondary" label="Chart" accessibilityLabel="Chart: jump to the trend chart" onPress={() => jumpTo(trend.current)} />
        ) : null}
      </View>
      <StayEndCard discharge={sheet.discharge} timeZone={sheet.infant.timeZone} clock={user.clock} />
      <CurrentPlacementCard
        infantId={sheet.infant.id}
        placement={sheet.infant.placement}
        timeZone={sheet.infant.timeZone}
        clock={user.clock}
        canChart={canChart && !sheet.discharge}
      />
      <PendingReadingCards infantId={sheet.infant.id} timeZone={sheet.infant.timeZone} />
      <View style={[styles.columns, wide && styles.columnsWide]}>
        {openFlags.map((f) => (
          <View key={f.key} style={wide ? styles.column : undefined}>
            <FlagCard flag={f} sheet={sheet} canChart={canChart} now={now} />
          </View>
        ))}
      </View>
      <ClosedFlags sheet={sheet} canChart={canChart && !sheet.discharge} />
      <SkinToSkinPanel sheet={sheet} canChart={canChart} now={now} />
      <Text variant="title" role="heading" aria-level={2}>
        Readings
      </Text>
      <Segmented
        label="Window"
        value={String(hours) as '12' | '24' | '72'}
        options={[
          { value: '12', label: '12 h' },
          { value: '24', label: '24 h' },
          { value: '72', label: '72 h' },
        ]}
        onChange={(h) => setHours(Number(h) as Hours)}
      />
      {sheet.readings.length === 0 ? (
        <Text tone="muted">No readings in this window.</Text>
      ) : wide ? (
        <ReadingGrid sheet={sheet} canChart={canChart} />
      ) : (
        // Newest first, a heading above each day ("Today", "Yesterday", "Wed 2 Dec") in the unit's zone.
        cards.map((r, i) => {
          const day = localDayKey(r.takenAt, sheet.infant.timeZone);
          const first = i === 0 || localDayKey(cards[i - 1]!.takenAt, sheet.infant.timeZone) !== day;
          return (
            <Fragment key={r.rootId}>
              {first ? (
                <Text variant="label" role="heading" aria-level={3} style={styles.day}>
                  {dayHeading(r.takenAt, sheet.infant.timeZone, now)}
                </Text>
              ) : null}
              <ReadingCard reading={r} sheet={sheet} canChart={canChart} now={now} />
            </Fragment>
          );
        })
      )}
      {/* After the readings, as the design orders them: the values first, the picture of them second.
          On a phone the chart is then off the first screen and its code loads only when scrolled near. */}
      <View ref={trend} nativeID="trend">
        <Card>
          <Text variant="title" role="heading" aria-level={2}>
            Trend
          </Text>
          <TrendChart sheet={sheet} unit={user.tempUnit} clock={user.clock} />
        </Card>
      </View>
      {corrected.length ? (
        <Card role="region" aria-label="Corrected entries">
          <Text variant="title" role="heading" aria-level={2}>
            Corrected entries
          </Text>
          {corrected.map((r) => (
            <History key={r.rootId} reading={r} sheet={sheet} />
          ))}
        </Card>
      ) : null}
      <SkinToSkinHistory sheet={sheet} now={now} />
    </View>
  );
}

function useCorrect(sheet: Flowsheet) {
  const router = useRouter();
  return (r: FlowsheetReading) => router.push(`/infants/${sheet.infant.id}/correct/${r.id}`);
}

function ReadingCard({ reading: r, sheet, canChart, now }: { reading: FlowsheetReading; sheet: Flowsheet; canChart: boolean; now: Date }) {
  const user = useUser();
  const tz = sheet.infant.timeZone;
  const correct = useCorrect(sheet);
  const [open, setOpen] = useState(false);
  const when = formatWhen(r.takenAt, tz, user.clock, now);
  return (
    <Card>
      <View style={styles.head}>
        <Text variant="bodyStrong">{when}</Text>
        {r.sessionId ? <StatusBadge tone="together" icon="hands" label="Skin-to-skin" /> : null}
        {r.corrected ? <StatusBadge tone="neutral" icon="review" label={`Corrected: ${CORRECTION_REASON_LABELS[r.correctionReason ?? 'corrected-value'].toLowerCase()}`} /> : null}
        {r.lateReason ? <StatusBadge tone="neutral" icon="clock" label="Late entry" /> : null}
      </View>
      <Text>
        Probe {temp(r.probeCenti, user.tempUnit)} · Remote {temp(r.remoteCenti, user.tempUnit)}
        {r.remoteSite ? ` (${SITE_LABELS[r.remoteSite].toLowerCase()})` : ''} · Set {temp(r.setCenti, user.tempUnit)}
      </Text>
      <Text tone="muted">
        {[
          r.controlMode ? CONTROL_MODE_LABELS[r.controlMode] : null,
          r.airCenti !== null ? `air ${temp(r.airCenti, user.tempUnit)}` : null,
          r.heaterOutputPct !== null ? `output ${r.heaterOutputPct} %` : null,
          r.heartRate !== null ? `HR ${r.heartRate}/min` : null,
          ...readingExtras(r),
          r.recordedBy.name,
        ]
          .filter(Boolean)
          .join(' · ')}
      </Text>
      {r.heatSigns.length ? (
        <Text variant="caption">Heat-stress signs: {r.heatSigns.map((sign) => HEAT_STRESS_SIGN_LABELS[sign as HeatStressSign] ?? 'another sign').join(', ')}</Text>
      ) : null}
      {r.note ? <Text variant="caption">{r.note}</Text> : null}
      {r.lateReason ? (
        <Text variant="caption" tone="muted">
          Charted late: {r.lateReason}
        </Text>
      ) : null}
      <View style={styles.badges}>
        {canChart ? <Button compact variant="secondary" label="Correct" accessibilityLabel={`Correct the reading of ${when}`} onPress={() => correct(r)} /> : null}
        {r.corrected ? <Button compact variant="quiet" label={open ? 'Hide history' : `History (${r.history.length + 1} versions)`} onPress={() => setOpen(!open)} /> : null}
      </View>
      {open ? <Versions reading={r} sheet={sheet} /> : null}
    </Card>
  );
}

/** Every version of a reading, oldest first: what it said, who saved it and when, and why it changed. */
function Versions({ reading: r, sheet }: { reading: FlowsheetReading; sheet: Flowsheet }) {
  const user = useUser();
  const tz = sheet.infant.timeZone;
  const versions: ReadingVersion[] = [...r.history, r];
  return (
    <View role="list" style={styles.versions} aria-label="Versions">
      {versions.map((v, i) => (
        <Text key={v.id} role="listitem" variant="caption">
          {i === versions.length - 1 ? 'Now' : `Version ${i + 1}`}:{' '}
          {v.enteredInError ? 'removed' : `probe ${temp(v.probeCenti, user.tempUnit)}, remote ${temp(v.remoteCenti, user.tempUnit)}, set ${temp(v.setCenti, user.tempUnit)}`} ·{' '}
          {v.recordedBy.name}, {dayTime(v.recordedAt, tz, user.clock)}
          {v.correctionReason ? ` · ${CORRECTION_REASON_LABELS[v.correctionReason]}: ${v.correctionNote ?? ''}` : ' · first entry'}
        </Text>
      ))}
    </View>
  );
}

function History({ reading: r, sheet }: { reading: FlowsheetReading; sheet: Flowsheet }) {
  const user = useUser();
  return (
    <View style={styles.history}>
      <Text variant="label">
        Reading of {dayTime(r.takenAt, sheet.infant.timeZone, user.clock)}
        {r.enteredInError ? ' (removed: entered in error)' : ''}
      </Text>
      <Versions reading={r} sheet={sheet} />
    </View>
  );
}

/** Readings per page of the wide grid: ten columns fit beside the row names on a desk screen. */
const GRID_PAGE = 10;

function ReadingGrid({ sheet, canChart }: { sheet: Flowsheet; canChart: boolean }) {
  const user = useUser();
  const { colors } = useTheme();
  const now = useNow();
  const correct = useCorrect(sheet);
  const tz = sheet.infant.timeZone;
  const pages = Math.max(1, Math.ceil(sheet.readings.length / GRID_PAGE));
  const [page, setPage] = useState(0);
  // A shorter window (or fewer readings) keeps the page in range.
  const shown = Math.min(page, pages - 1);
  const cols = sheet.readings.slice(shown * GRID_PAGE, shown * GRID_PAGE + GRID_PAGE);
  const first = shown * GRID_PAGE + 1;
  const last = shown * GRID_PAGE + cols.length;
  const rows: [string, (r: FlowsheetReading) => string][] = [
    ['Probe', (r) => temp(r.probeCenti, user.tempUnit)],
    ['Remote site', (r) => temp(r.remoteCenti, user.tempUnit)],
    ['Site', (r) => (r.remoteSite ? SITE_LABELS[r.remoteSite] : '—')],
    ['Set', (r) => temp(r.setCenti, user.tempUnit)],
    ['Air', (r) => temp(r.airCenti, user.tempUnit)],
    ['Mode', (r) => (r.controlMode ? CONTROL_MODE_LABELS[r.controlMode] : '—')],
    ['Output', (r) => (r.heaterOutputPct === null ? '—' : `${r.heaterOutputPct} %`)],
    ['Heart rate', (r) => (r.heartRate === null ? '—' : String(r.heartRate))],
    ...PLACEMENT_GRID_ROWS,
    ['By', (r) => r.recordedBy.name.split(' ')[0] ?? ''],
  ];
  return (
    <Card>
      <View role="table" aria-label="Readings" style={styles.grid}>
        <View role="row" style={[styles.gridRow, { borderBottomColor: colors.border }]}>
          <Text role="rowheader" variant="label" style={styles.gridHead}>
            Day
          </Text>
          {cols.map((r, i) => {
            // The day is named where it changes (and on the first column), in the unit's zone.
            const named = i === 0 || localDayKey(cols[i - 1]!.takenAt, tz) !== localDayKey(r.takenAt, tz);
            return (
              <Text key={r.id} role="cell" variant="caption" style={styles.gridCell}>
                {named ? dayHeading(r.takenAt, tz, now) : ''}
              </Text>
            );
          })}
        </View>
        <View role="row" style={[styles.gridRow, { borderBottomColor: colors.border }]}>
          <Text role="columnheader" variant="label" style={styles.gridHead}>
            Time
          </Text>
          {cols.map((r) => (
            <Text key={r.id} role="columnheader" variant="label" style={styles.gridCell}>
              {/* The day is in the row above: the time alone here. */}
              {formatClock(r.takenAt, tz, user.clock)}
              {r.corrected ? ' ✎' : ''}
            </Text>
          ))}
        </View>
        {rows.map(([label, pick], i) => (
          <View key={label} role="row" style={[styles.gridRow, { borderBottomColor: colors.border }, i % 2 === 1 && { backgroundColor: colors.surfaceSunken }]}>
            <Text role="rowheader" variant="label" style={styles.gridHead}>
              {label}
            </Text>
            {cols.map((r) => (
              <Text key={r.id} role="cell" style={styles.gridCell}>
                {pick(r)}
              </Text>
            ))}
          </View>
        ))}
        {canChart ? (
          <View role="row" style={styles.gridRow}>
            <Text role="rowheader" variant="label" style={styles.gridHead}>
              {' '}
            </Text>
            {cols.map((r) => (
              <View key={r.id} role="cell" style={styles.gridCell}>
                <Pressable role="button" aria-label={`Correct the reading of ${formatWhen(r.takenAt, tz, user.clock, now)}`} onPress={() => correct(r)} style={styles.gridLink}>
                  <Text variant="caption" tone="primary" style={styles.underline}>
                    Correct
                  </Text>
                </Pressable>
              </View>
            ))}
          </View>
        ) : null}
      </View>
      <View style={styles.pager} role="group" aria-label="Pages of readings">
        <Button compact variant="secondary" label="Newer" disabled={shown === 0} onPress={() => setPage(shown - 1)} />
        <Text variant="label" accessibilityLiveRegion="polite">
          Readings {first}–{last} of {sheet.readings.length}, newest first
        </Text>
        <Button compact variant="secondary" label="Older" disabled={shown >= pages - 1} onPress={() => setPage(shown + 1)} />
      </View>
      <Text variant="caption" tone="muted">
        ✎ marks a corrected entry: its history is under Corrected entries.
      </Text>
    </Card>
  );
}

const styles = StyleSheet.create({
  body: { gap: 14 },
  badges: { flexDirection: 'row', flexWrap: 'wrap', gap: 8, alignItems: 'center' },
  head: { flexDirection: 'row', flexWrap: 'wrap', gap: 8, alignItems: 'center' },
  columns: { gap: 14 },
  columnsWide: { flexDirection: 'row', flexWrap: 'wrap', alignItems: 'flex-start' },
  column: { flexBasis: 420, flexGrow: 1 },
  versions: { gap: 4 },
  history: { gap: 4, paddingVertical: 4 },
  grid: { gap: 0 },
  gridRow: { flexDirection: 'row', alignItems: 'center', minHeight: 36, borderBottomWidth: StyleSheet.hairlineWidth },
  gridHead: { width: 110 },
  gridCell: { width: 72, textAlign: 'center', alignItems: 'center' },
  gridLink: { minHeight: 44, minWidth: 64, alignItems: 'center', justifyContent: 'center' },
  underline: { textDecorationLine: 'underline' },
  pager: { flexDirection: 'row', flexWrap: 'wrap', alignItems: 'center', gap: 12 },
  day: { marginTop: 4 },
});

/** Scroll a section to the top of the screen and move the reader there (web). */
function jumpTo(node: View | null) {
  const el = node as unknown as { scrollIntoView?: (o: object) => void; focus?: (o?: object) => void; setAttribute?: (k: string, v: string) => void } | null;
  el?.setAttribute?.('tabindex', '-1');
  el?.scrollIntoView?.({ block: 'start' });
  el?.focus?.({ preventScroll: true });
}
