import { StyleSheet, View, useWindowDimensions } from 'react-native';
import { Card } from '@/components/ui/card';
import { formatDayTime, type ClockSetting } from '@/components/ui/format-time';
import { StatusBadge } from '@/components/ui/status-badge';
import { Text } from '@/components/ui/text';
import { useTheme } from '@/components/theme/theme-provider';
import { CONTROL_MODE_LABELS, FLAG_CLOSED_HOW_LABELS, HEAT_SOURCE_LABELS } from '@/shared/vocabulary';
import { HEAT_STRESS_SIGN_LABELS, type HeatStressSign } from '@/shared/thermal/heat-stress';
import { formatTemperature, type TempUnit } from '@/shared/thermal/units';
import type { HandoverInfant, HandoverReading } from '@/shared/types/board';
import { escalationLine, flagLook } from '@/components/board/flag-look';
import { actionWords } from '@/components/bedside/format';
import { placementWords } from '@/components/bedside/placement-values';

const TABLE_BREAKPOINT = 720;

/** Times in the unit's zone, by the user's clock setting. */
const when = (iso: string, timeZone: string, clock: ClockSetting): string => formatDayTime(iso, timeZone, clock);

const t = (centi: number | null, unit: TempUnit) => (centi === null ? '—' : formatTemperature(centi, unit));

/** One infant's handover: who, settings now, what is outstanding, then the last 12 hours. */
export function HandoverView({ handover, tempUnit, timeZone, clock }: { handover: HandoverInfant; tempUnit: TempUnit; timeZone: string; clock: ClockSetting }) {
  const { infant, settings, nextCheck } = handover;
  const open = handover.flags.filter((f) => f.closedAt === null);
  return (
    <Card style={styles.card} role="article" aria-label={`Handover for ${infant.displayName}`}>
      <View style={styles.head}>
        <Text variant="heading" role="heading" aria-level={2}>
          {infant.bedLabel ?? '—'} · {infant.displayName}
        </Text>
        <Text tone="muted">
          {infant.gestationWeeks}+{infant.gestationDays} weeks at birth · {infant.weightGrams} g · {HEAT_SOURCE_LABELS[infant.heatSource]} · nurse{' '}
          {handover.nurse?.name ?? 'unassigned'}
        </Text>
        <Text variant="caption" tone="muted">
          {when(handover.from, timeZone, clock)} to {when(handover.to, timeZone, clock)} ({timeZone})
        </Text>
      </View>

      <View data-print-block style={styles.section}>
        <Text variant="title" aria-level={3}>
          Settings now
        </Text>
        <Text>
          {settings.controlMode ? CONTROL_MODE_LABELS[settings.controlMode] : 'Mode not charted'} · set {t(settings.setCenti, tempUnit)}
          {settings.heaterOutputPct !== null ? ` · heater ${settings.heaterOutputPct} %` : ''} · probe {t(settings.probeCenti, tempUnit)} · remote site{' '}
          {t(settings.remoteCenti, tempUnit)}
        </Text>
        <Text>{placementWords(settings.placement) ?? 'Probe placement not charted'}</Text>
        {settings.placement?.prompt ? (
          <Text tone="danger" role="alert">
            {settings.placement.prompt.text}
          </Text>
        ) : null}
      </View>

      <View style={styles.section}>
        <Text variant="title" aria-level={3}>
          Outstanding
        </Text>
        <View style={styles.badges}>
          <StatusBadge
            tone={nextCheck.status === 'overdue' ? 'danger' : nextCheck.status === 'due-soon' ? 'warning' : 'ok'}
            icon="clock"
            label={
              nextCheck.dueAt
                ? nextCheck.status === 'overdue'
                  ? `Remote-site check overdue since ${when(nextCheck.dueAt, timeZone, clock)}`
                  : `Next remote-site check due ${when(nextCheck.dueAt, timeZone, clock)}`
                : 'No remote-site check charted'
            }
          />
          {handover.checks?.manual ? (
            <StatusBadge
              tone={handover.checks.manual.status === 'overdue' ? 'danger' : 'warning'}
              icon="hand"
              label={`Manual mode since ${when(handover.checks.manual.since, timeZone, clock)}: ${handover.checks.manual.status === 'overdue' ? 'check overdue since' : 'next check due'} ${when(handover.checks.manual.dueAt!, timeZone, clock)} (every ${handover.checks.manual.limitMinutes} min)`}
            />
          ) : null}
          {(handover.checks?.rechecks ?? []).map((r) => (
            <StatusBadge
              key={r.flagId}
              tone={r.status === 'overdue' ? 'danger' : 'warning'}
              icon="clock"
              label={`Recheck ${r.status === 'overdue' ? 'overdue since' : 'due'} ${when(r.dueAt!, timeZone, clock)}`}
            />
          ))}
          {open.map((f) => {
            const look = flagLook(f);
            return <StatusBadge key={f.id} tone={look.tone} icon={look.icon} label={`${look.label} since ${when(f.raisedAt, timeZone, clock)}`} />;
          })}
        </View>
      </View>

      <View style={styles.section}>
        <Text variant="title" aria-level={3}>
          Readings ({handover.readings.length})
        </Text>
        {handover.readings.length === 0 ? (
          <Text tone="muted">No readings in the last 12 hours.</Text>
        ) : (
          <ReadingsTable readings={handover.readings} tempUnit={tempUnit} timeZone={timeZone} clock={clock} />
        )}
      </View>

      <View style={styles.section}>
        <Text variant="title" aria-level={3}>
          Flags and actions
        </Text>
        {handover.flags.length === 0 ? <Text tone="muted">No flags in the last 12 hours.</Text> : null}
        {handover.flags.map((f) => (
          <View key={f.id} data-print-block style={styles.flag}>
            <Text variant="bodyStrong">
              {flagLook(f).label}: raised {when(f.raisedAt, timeZone, clock)}
              {f.closedAt
                ? `, ${f.how === 'withdrawn' ? 'withdrawn' : 'closed'} ${when(f.closedAt, timeZone, clock)}${f.how && FLAG_CLOSED_HOW_LABELS[f.how] ? ` ${FLAG_CLOSED_HOW_LABELS[f.how]}` : ''}`
                : ', still open'}
            </Text>
            {escalationLine(f.escalation, timeZone, clock) ? <Text variant="caption">{escalationLine(f.escalation, timeZone, clock)}</Text> : null}
            {f.actions.map((a, i) => (
              <Text key={i} variant="caption" tone="muted">
                {when(a.at, timeZone, clock)} · {actionWords(a)} · {a.by}
              </Text>
            ))}
          </View>
        ))}
      </View>

      <View style={styles.section}>
        <Text variant="title" aria-level={3}>
          Skin-to-skin sessions
        </Text>
        {handover.sessions.length === 0 ? <Text tone="muted">None in the last 12 hours.</Text> : null}
        {handover.sessions.map((s) => (
          <Text key={s.id}>
            {when(s.startedAt, timeZone, clock)} to {s.endedAt ? when(s.endedAt, timeZone, clock) : 'now'} · reference {t(s.referenceCenti, tempUnit)}, deviation limit{' '}
            {(s.limitCenti / 100).toFixed(1)} °C
            {s.carer ? ` · with ${s.carer}` : ''}
          </Text>
        ))}
      </View>
    </Card>
  );
}

function ReadingsTable({ readings, tempUnit, timeZone, clock }: { readings: HandoverReading[]; tempUnit: TempUnit; timeZone: string; clock: ClockSetting }) {
  const { width } = useWindowDimensions();
  const { colors } = useTheme();
  const rows = [...readings].reverse();
  if (width < TABLE_BREAKPOINT) {
    return (
      <View style={styles.lines}>
        {rows.map((r) => (
          <View key={r.id} style={[styles.line, { borderBottomColor: colors.border }]}>
            <Text variant="bodyStrong">{when(r.takenAt, timeZone, clock)}</Text>
            <Text>
              probe {t(r.probeCenti, tempUnit)} · remote {t(r.remoteCenti, tempUnit)}
              {r.remoteSite ? ` (${r.remoteSite})` : ''} · set {t(r.setCenti, tempUnit)}
              {r.controlMode ? ` ${CONTROL_MODE_LABELS[r.controlMode].toLowerCase()}` : ''}
              {r.heartRate !== null ? ` · HR ${r.heartRate}` : ''}
            </Text>
            {r.note ? (
              <Text variant="caption" tone="muted">
                {r.note}
              </Text>
            ) : null}
          </View>
        ))}
      </View>
    );
  }
  const head = ['Time', 'Probe', 'Remote site', 'Air', 'Set', 'Mode', 'Heater', 'HR', 'Note', 'By'];
  return (
    <View role="table" aria-label="Readings, newest first">
      <View role="row" style={[styles.tr, { borderBottomColor: colors.text }]}>
        {head.map((h, i) => (
          <Text key={h} role="columnheader" variant="label" style={[styles.td, i === 8 && styles.wide]}>
            {h}
          </Text>
        ))}
      </View>
      {rows.map((r) => (
        <View key={r.id} role="row" style={[styles.tr, { borderBottomColor: colors.border }]} data-print-block>
          {[
            when(r.takenAt, timeZone, clock),
            t(r.probeCenti, tempUnit),
            `${t(r.remoteCenti, tempUnit)}${r.remoteSite ? ` ${r.remoteSite}` : ''}`,
            t(r.airCenti, tempUnit),
            t(r.setCenti, tempUnit),
            r.controlMode ? CONTROL_MODE_LABELS[r.controlMode] : '—',
            r.heaterOutputPct !== null ? `${r.heaterOutputPct} %` : '—',
            r.heartRate !== null ? String(r.heartRate) : '—',
            [r.heatSigns.map((sign) => HEAT_STRESS_SIGN_LABELS[sign as HeatStressSign] ?? 'another sign').join(', '), r.note ?? ''].filter(Boolean).join(' · ') || '',
            r.recordedBy,
          ].map((cell, i) => (
            <Text key={i} role="cell" variant="caption" style={[styles.td, i === 8 && styles.wide]}>
              {cell}
            </Text>
          ))}
        </View>
      ))}
    </View>
  );
}

const styles = StyleSheet.create({
  card: { gap: 16 },
  head: { gap: 4 },
  section: { gap: 6 },
  badges: { flexDirection: 'row', flexWrap: 'wrap', gap: 6 },
  flag: { gap: 2 },
  lines: { gap: 0 },
  line: { paddingVertical: 6, borderBottomWidth: 1, gap: 2 },
  tr: { flexDirection: 'row', borderBottomWidth: 1, paddingVertical: 4, gap: 6 },
  td: { flex: 1, minWidth: 0 },
  wide: { flex: 2.5 },
});
