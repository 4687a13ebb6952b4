import { useRouter } from 'expo-router';
import { useQueryClient } from '@tanstack/react-query';
import { useEffect, useState } from 'react';
import { StyleSheet, useWindowDimensions, View } from 'react-native';
import { ACTION_LABELS, type ActionKind } from '@/shared/schemas/bedside';
import { CLINICAL_PROMPT_CAVEAT, HEAT_STRESS_CHECKLIST, HEAT_STRESS_SIGNS } from '@/shared/thermal';
import type { Flowsheet, FlowsheetFlag, FlowsheetReading } from '@/shared/types/bedside';
import { problemOf } from '../api/client';
import { useUser } from '../auth/auth-provider';
import { useEndSkinToSkinMutation, useFlagActionMutation, useFlowsheetQuery } from '../queries/infants';
import { useTheme } from '../theme/theme-provider';
import { WIDE_BREAKPOINT } from '../theme/theme';
import { Button } from '../ui/button';
import { Card } from '../ui/card';
import { Screen } from '../ui/screen';
import { Segmented } from '../ui/segmented';
import { ErrorState, LoadingState } from '../ui/state-view';
import { StatusBadge } from '../ui/status-badge';
import { Text } from '../ui/text';
import { CheckBadge } from './check-badge';
import { clockTime, CONTROL_MODE_LABELS, dayTime, duration, FLAG_LABELS, SITE_LABELS, temp, tempDelta } from './format';
import { startPendingFlush, usePendingReadings } from './pending-readings';
import { TrendChart } from './trend-chart';
import { useNow } from './use-now';

type Hours = 12 | 24 | 72;

export function FlowsheetScreen({ infantId }: { infantId: string }) {
  const [hours, setHours] = useState<Hours>(12);
  const query = useFlowsheetQuery(infantId, hours);
  const router = useRouter();
  const user = useUser();
  const canChart = user.role === 'nurse' || user.role === 'charge';
  const sheet = query.data;
  const queryClient = useQueryClient();
  useEffect(() => startPendingFlush(queryClient), [queryClient]);
  return (
    <Screen
      title={sheet ? `${sheet.infant.bedLabel ?? ''} · ${sheet.infant.displayName}` : 'Flowsheet'}
      subtitle="Flowsheet"
      refreshing={query.isRefetching}
      onRefresh={() => void query.refetch()}
      actions={canChart ? <Button label="Record" icon="plus" onPress={() => router.push(`/infants/${infantId}/record`)} /> : null}
    >
      {query.isError && !sheet ? (
        <ErrorState error={query.error} onRetry={() => void query.refetch()} />
      ) : !sheet ? (
        <LoadingState label="Loading the flowsheet…" />
      ) : (
        <FlowsheetBody sheet={sheet} hours={hours} setHours={setHours} canChart={canChart} />
      )}
    </Screen>
  );
}

function FlowsheetBody({ sheet, hours, setHours, canChart }: { sheet: Flowsheet; hours: Hours; setHours: (h: Hours) => void; canChart: boolean }) {
  const user = useUser();
  const now = useNow();
  const { width } = useWindowDimensions();
  const pending = usePendingReadings(sheet.infant.id);
  const openFlags = sheet.flags.filter((f) => f.status === 'open');
  const closedFlags = sheet.flags.filter((f) => f.status === 'closed');
  return (
    <View style={styles.body}>
      <View style={styles.badges}>
        <CheckBadge next={sheet.nextCheck} now={now} />
        {openFlags.length === 0 ? <StatusBadge tone="ok" icon="check" label="No open flags" /> : null}
      </View>
      {pending.map((p) => (
        <Card key={p.body.id} role="status">
          <StatusBadge tone="warning" icon="cloud-off" label={p.refusal ? 'Not saved: refused' : 'Not yet saved'} />
          <Text>
            Probe {p.body.probe ?? '—'} · remote site {p.body.remote ?? '—'} °{p.body.unit} at {clockTime(p.body.takenAt, sheet.infant.timeZone, user.clock)}
          </Text>
          <Text variant="caption" tone="muted">
            {p.refusal ?? 'Kept on this device; it is sent when the connection returns.'}
          </Text>
        </Card>
      ))}
      {openFlags.map((f) => (
        <FlagCard key={f.key} flag={f} sheet={sheet} canChart={canChart} now={now} />
      ))}
      {sheet.infant.skinToSkin ? <SessionCard sheet={sheet} canChart={canChart} now={now} /> : null}
      <Card>
        <Text variant="title" role="heading" aria-level={2}>
          Trend
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
        <TrendChart sheet={sheet} unit={user.tempUnit} clock={user.clock} />
      </Card>
      <Text variant="title" role="heading" aria-level={2}>
        Readings
      </Text>
      {sheet.readings.length === 0 ? <Text tone="muted">No readings in this window.</Text> : width >= WIDE_BREAKPOINT ? <ReadingGrid sheet={sheet} /> : sheet.readings.map((r) => <ReadingCard key={r.rootId} reading={r} sheet={sheet} />)}
      {closedFlags.length ? (
        <Card>
          <Text variant="title" role="heading" aria-level={2}>
            Closed flags
          </Text>
          {closedFlags.map((f) => (
            <Text key={f.key}>
              {FLAG_LABELS[f.kind]} raised {clockTime(f.raisedAt, sheet.infant.timeZone, user.clock)}, closed {f.closedAt ? clockTime(f.closedAt, sheet.infant.timeZone, user.clock) : ''} · {f.actions.map((a) => ACTION_LABELS[a.kind as ActionKind] ?? a.kind).join(', ') || 'no actions'}
            </Text>
          ))}
        </Card>
      ) : null}
    </View>
  );
}

const GAP_ACTIONS: ActionKind[] = ['checked-probe-contact', 'checked-cover', 'moved-probe', 'adjusted-set-temperature', 'changed-control-mode'];
const HEAT_ACTIONS: ActionKind[] = ['adjusted-set-temperature', 'checked-probe-contact', 'removed-coverings', 'reduced-heater-output', 'informed-charge-nurse'];
const OTHER_ACTIONS: ActionKind[] = ['checked-probe-contact', 'adjusted-set-temperature', 'informed-charge-nurse'];

function FlagCard({ flag, sheet, canChart, now }: { flag: FlowsheetFlag; sheet: Flowsheet; canChart: boolean; now: Date }) {
  const user = useUser();
  const router = useRouter();
  const { colors } = useTheme();
  const mutation = useFlagActionMutation(sheet.infant.id);
  const tz = sheet.infant.timeZone;
  const kinds = flag.kind === 'gap' ? GAP_ACTIONS : flag.kind === 'heat-stress' ? HEAT_ACTIONS : flag.kind === 'overdue-check' ? [] : OTHER_ACTIONS;
  const done = new Set(flag.actions.map((a) => a.kind));
  const detail = flag.detail as { gapCenti?: number; limitCenti?: number; minutesLate?: number };
  const recheckMs = flag.recheckDueAt ? Date.parse(flag.recheckDueAt) - now.getTime() : null;
  return (
    <Card style={{ borderColor: colors.danger, borderWidth: 2 }} role="region" aria-label={FLAG_LABELS[flag.kind]}>
      <StatusBadge tone={flag.kind === 'heat-stress' ? 'heat' : 'danger'} icon={flag.kind === 'heat-stress' ? 'flame' : 'alert'} label={`${FLAG_LABELS[flag.kind]} open${flag.escalated ? ', escalated' : ''}`} large />
      <Text>
        Raised {clockTime(flag.raisedAt, tz, user.clock)}
        {flag.kind === 'gap' && detail.gapCenti !== undefined ? ` · probe and remote site ${tempDelta(detail.gapCenti, user.tempUnit)} apart (limit ${tempDelta(detail.limitCenti ?? 50, user.tempUnit)})` : ''}
      </Text>
      {recheckMs !== null ? (
        <StatusBadge tone={recheckMs < 0 ? 'danger' : 'warning'} icon="clock" label={recheckMs < 0 ? `Recheck overdue by ${duration(-recheckMs)}` : `Recheck due in ${duration(recheckMs)}`} />
      ) : null}
      {flag.kind === 'heat-stress' ? (
        <View>
          <Text variant="label">Signs to look for: {HEAT_STRESS_SIGNS.map((s) => s.label.toLowerCase()).join(', ')}.</Text>
          {HEAT_STRESS_CHECKLIST.map((s) => (
            <Text key={s} variant="caption">
              • {s}
            </Text>
          ))}
        </View>
      ) : null}
      {flag.actions.map((a) => (
        <Text key={a.id} variant="caption">
          ✓ {ACTION_LABELS[a.kind as ActionKind] ?? a.kind} · {a.recordedBy.name} at {clockTime(a.at, tz, user.clock)}
        </Text>
      ))}
      {canChart && flag.id ? (
        <View style={styles.badges} role="group" aria-label="Actions taken">
          {kinds.map((kind) => (
            <Button
              key={kind}
              compact
              variant={done.has(kind) ? 'quiet' : 'secondary'}
              label={ACTION_LABELS[kind]}
              icon={done.has(kind) ? 'check' : undefined}
              busy={mutation.isPending && mutation.variables?.body.kind === kind}
              onPress={() => mutation.mutate({ flagId: flag.id!, body: { id: globalThis.crypto.randomUUID(), kind } })}
            />
          ))}
          <Button compact label={flag.kind === 'overdue-check' ? 'Record the check' : 'Record recheck'} icon="thermometer" onPress={() => router.push(`/infants/${sheet.infant.id}/record`)} />
        </View>
      ) : null}
      {mutation.isError ? <Text tone="danger">{problemOf(mutation.error).message}</Text> : null}
      <Text variant="caption" tone="muted">
        {CLINICAL_PROMPT_CAVEAT} Recheck {sheet.policy.recheckMinutes} minutes after an action.
      </Text>
    </Card>
  );
}

function SessionCard({ sheet, canChart, now }: { sheet: Flowsheet; canChart: boolean; now: Date }) {
  const user = useUser();
  const s = sheet.infant.skinToSkin!;
  const end = useEndSkinToSkinMutation(sheet.infant.id);
  return (
    <Card role="region" aria-label="Skin-to-skin session">
      <StatusBadge tone="together" icon="hands" label="Skin-to-skin session running" large />
      <Text>
        Since {clockTime(s.startedAt, sheet.infant.timeZone, user.clock)} ({duration(now.getTime() - Date.parse(s.startedAt))}) · reference {temp(s.referenceCenti, user.tempUnit)} · deviation limit{' '}
        {tempDelta(s.limitCenti, user.tempUnit)}
      </Text>
      {canChart ? <Button label="End session" variant="secondary" busy={end.isPending} onPress={() => end.mutate(s.id)} /> : null}
      {end.isError ? <Text tone="danger">{problemOf(end.error).message}</Text> : null}
    </Card>
  );
}

function ReadingCard({ reading: r, sheet }: { reading: FlowsheetReading; sheet: Flowsheet }) {
  const user = useUser();
  const tz = sheet.infant.timeZone;
  const [open, setOpen] = useState(false);
  return (
    <Card>
      <Text variant="bodyStrong">
        {clockTime(r.takenAt, tz, user.clock)}
        {r.corrected ? ' · corrected' : ''}
        {r.lateReason ? ' · late entry' : ''}
      </Text>
      <Text>
        Probe {temp(r.probeCenti, user.tempUnit)} · Remote {temp(r.remoteCenti, user.tempUnit)}
        {r.remoteSite ? ` (${SITE_LABELS[r.remoteSite].toLowerCase()})` : ''} · Set {temp(r.setCenti, user.tempUnit)}
      </Text>
      <Text tone="muted">
        {r.controlMode ? CONTROL_MODE_LABELS[r.controlMode] : ''}
        {r.airCenti !== null ? ` · air ${temp(r.airCenti, user.tempUnit)}` : ''}
        {r.heaterOutputPct !== null ? ` · output ${r.heaterOutputPct} %` : ''}
        {r.heartRate !== null ? ` · HR ${r.heartRate}/min` : ''}
        {' · '}
        {r.recordedBy.name}
      </Text>
      {r.note ? <Text variant="caption">{r.note}</Text> : null}
      {r.corrected ? (
        <>
          <Button compact variant="quiet" label={open ? 'Hide history' : `History (${r.history.length + 1} versions)`} onPress={() => setOpen(!open)} />
          {open
            ? [...r.history, r].map((v) => (
                <Text key={v.id} variant="caption">
                  {dayTime(v.recordedAt, tz, user.clock)} · {v.recordedBy.name} · probe {temp(v.probeCenti, user.tempUnit)}, remote {temp(v.remoteCenti, user.tempUnit)}
                  {v.correctionReason ? ` · ${v.correctionReason.replace(/-/g, ' ')}: ${v.correctionNote ?? ''}` : ' · first entry'}
                </Text>
              ))
            : null}
        </>
      ) : null}
    </Card>
  );
}

function ReadingGrid({ sheet }: { sheet: Flowsheet }) {
  const user = useUser();
  const cols = sheet.readings.slice(0, 24);
  const rows: Array<[string, (r: FlowsheetReading) => string]> = [
    ['Probe', (r) => temp(r.probeCenti, user.tempUnit)],
    ['Remote site', (r) => temp(r.remoteCenti, user.tempUnit)],
    ['Site', (r) => (r.remoteSite ? SITE_LABELS[r.remoteSite] : '—')],
    ['Set', (r) => temp(r.setCenti, user.tempUnit)],
    ['Air', (r) => temp(r.airCenti, user.tempUnit)],
    ['Mode', (r) => (r.controlMode ? CONTROL_MODE_LABELS[r.controlMode] : '—')],
    ['Output', (r) => (r.heaterOutputPct === null ? '—' : `${r.heaterOutputPct} %`)],
    ['Heart rate', (r) => (r.heartRate === null ? '—' : String(r.heartRate))],
  ];
  return (
    <View role="table" style={styles.grid}>
      <View role="row" style={styles.gridRow}>
        <Text role="columnheader" variant="label" style={styles.gridHead}>
          Time
        </Text>
        {cols.map((r) => (
          <Text key={r.id} role="columnheader" variant="label" style={styles.gridCell}>
            {clockTime(r.takenAt, sheet.infant.timeZone, user.clock)}
            {r.corrected ? ' *' : ''}
          </Text>
        ))}
      </View>
      {rows.map(([label, pick]) => (
        <View key={label} role="row" style={styles.gridRow}>
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
      <Text variant="caption" tone="muted">
        * corrected: open the reading on a phone-width view for its history.
      </Text>
    </View>
  );
}

const styles = StyleSheet.create({
  body: { gap: 14 },
  badges: { flexDirection: 'row', flexWrap: 'wrap', gap: 8 },
  grid: { gap: 2 },
  gridRow: { flexDirection: 'row' },
  gridHead: { width: 110 },
  gridCell: { width: 76, textAlign: 'center' },
});
