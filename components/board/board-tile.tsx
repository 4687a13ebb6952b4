import { StyleSheet, View } from 'react-native';
import { Button } from '@/components/ui/button';
import { Icon } from '@/components/ui/icon';
import type { ClockSetting } from '@/components/ui/format-time';
import { StatusBadge } from '@/components/ui/status-badge';
import { Text } from '@/components/ui/text';
import { useTheme } from '@/components/theme/theme-provider';
import { CONTROL_MODE_LABELS, HEAT_SOURCE_LABELS } from '@/shared/vocabulary';
import { formatTemperature, type TempUnit } from '@/shared/thermal/units';
import type { BoardBed } from '@/shared/types/board';
import { ageOf, clockTime, countdown } from './board-format';
import { escalationLine, flagLook } from './flag-look';

/** Which check the countdown is for, in words, when it is not the routine remote-site check. */
export function clockCaption(infant: NonNullable<BoardBed['infant']>, clock: ClockSetting): string | null {
  const next = infant.checks?.next;
  const manual = infant.checks?.manual;
  if (next?.clock === 'manual' && manual) {
    const output = manual.outputPct !== null ? ` at ${manual.outputPct} % output` : '';
    return `Manual mode since ${clockTime(manual.since, infant.timeZone, clock)}${output}: nothing regulates the heat, so check every ${manual.limitMinutes} min`;
  }
  if (next?.clock === 'recheck') return 'Recheck after an action';
  return null;
}

export interface BoardTileProps {
  bed: BoardBed;
  nowMs: number;
  tempUnit: TempUnit;
  timeZone: string;
  clock: ClockSetting;
  dueSoonMinutes: number;
  canManage: boolean;
  acknowledging: string | null;
  onManage: (bed: BoardBed) => void;
  onAcknowledge: (escalationId: string) => void;
  width: number | `${number}%`;
}

/** One bed, readable from across the room: the countdown and the values in display type. */
export function BoardTile({ bed, nowMs, tempUnit, timeZone, clock, dueSoonMinutes, canManage, acknowledging, onManage, onAcknowledge, width }: BoardTileProps) {
  const theme = useTheme();
  const c = theme.colors;
  const infant = bed.infant;
  const edge = bed.tier === 0 ? c.danger : bed.tier === 1 ? c.warning : c.border;

  if (!infant) {
    return (
      <View
        role="listitem"
        style={[styles.tile, styles.empty, { width, borderColor: c.border, backgroundColor: c.background }]}
        aria-label={`Bed ${bed.label}, empty`}
        testID={`bed-${bed.label}`}
      >
        <Text variant="heading">{bed.label}</Text>
        <Text tone="muted" variant="bodyStrong">
          Empty bed
        </Text>
        {canManage ? <Button label={`Admit to ${bed.label}`} icon="plus" variant="secondary" compact onPress={() => onManage(bed)} /> : null}
      </View>
    );
  }

  const next = infant.checks?.next ?? infant.nextCheck;
  const due = countdown(next.dueAt, nowMs, dueSoonMinutes);
  const caption = clockCaption(infant, clock);
  const probe = infant.latest.probe;
  const remote = infant.latest.remote;
  return (
    <View
      role="listitem"
      style={[styles.tile, { width, borderColor: edge, borderWidth: bed.tier <= 1 ? 4 : 2, backgroundColor: c.surface }]}
      aria-label={`Bed ${bed.label}, ${infant.displayName}`}
      testID={`bed-${bed.label}`}
    >
      <View style={styles.head}>
        <Text variant="display" style={styles.bed}>
          {bed.label}
        </Text>
        <View style={styles.who}>
          <Text variant="title" numberOfLines={1}>
            {infant.displayName}
          </Text>
          <Text tone="muted" variant="label">
            {infant.gestationWeeks}+{infant.gestationDays} wk · {infant.weightGrams} g
          </Text>
        </View>
      </View>

      <View style={[styles.countdown, { backgroundColor: due.tone === 'danger' ? c.dangerSoft : due.tone === 'warning' ? c.warningSoft : c.surfaceSunken }]}>
        {/* The word says the state; the icon and colour repeat it for a glance across the room. */}
        <Icon name={due.icon} size={30} color={due.tone === 'danger' ? c.danger : due.tone === 'warning' ? c.warning : c.text} />
        <Text variant="display" style={[styles.countdownText, { color: due.tone === 'danger' ? c.danger : due.tone === 'warning' ? c.warning : c.text }]} accessibilityLiveRegion="none">
          {due.text}
        </Text>
      </View>
      {caption ? (
        <Text variant="label" tone={due.tone === 'danger' ? 'danger' : 'muted'}>
          {caption}
        </Text>
      ) : null}

      <View style={styles.values}>
        <View style={styles.value}>
          <Text variant="caption" tone="muted">
            Probe
          </Text>
          <Text variant="heading">{probe ? formatTemperature(probe.centi, tempUnit) : '—'}</Text>
          <Text variant="caption" tone="muted">
            {probe ? ageOf(probe.takenAt, nowMs) : 'none charted'}
          </Text>
        </View>
        <View style={styles.value}>
          <Text variant="caption" tone="muted">
            Remote site{remote?.site ? ` (${remote.site})` : ''}
          </Text>
          <Text variant="heading">{remote ? formatTemperature(remote.centi, tempUnit) : '—'}</Text>
          <Text variant="caption" tone="muted">
            {remote ? ageOf(remote.takenAt, nowMs) : 'none charted'}
          </Text>
        </View>
      </View>

      <Text variant="label" tone="muted">
        {HEAT_SOURCE_LABELS[infant.heatSource]} · {infant.controlMode ? CONTROL_MODE_LABELS[infant.controlMode] : 'mode not charted'}
        {infant.setCenti !== null ? ` · set ${formatTemperature(infant.setCenti, tempUnit)}` : ''}
      </Text>

      <View style={styles.badges}>
        {infant.openFlags.map((f) => {
          const look = flagLook(f);
          return <StatusBadge key={f.key} tone={look.tone} icon={look.icon} label={look.label} large />;
        })}
        {infant.skinToSkin ? <StatusBadge tone="together" icon="hands" label={`Skin-to-skin since ${clockTime(infant.skinToSkin.startedAt, timeZone, clock)}`} large /> : null}
      </View>

      {/* Only an escalation that went out is shown: "escalated" must name whom it reached. */}
      {bed.escalations.filter((e) => e.sentAt).map((e) => (
        <View key={e.id} style={[styles.escalation, { borderColor: e.acknowledgedAt ? c.border : c.danger }]}>
          <StatusBadge
            tone={e.acknowledgedAt ? 'neutral' : 'danger'}
            icon="bell"
            label={`${flagLook({ kind: e.flagKind, severity: e.severity }).label}. ${escalationLine({ id: e.id, sentAt: e.sentAt!, to: e.to, how: 'email', acknowledgedAt: e.acknowledgedAt, acknowledgedBy: e.acknowledgedBy }, timeZone, clock)}`}
          />
          {!e.acknowledgedAt && canManage ? (
            <Button label="Acknowledge" variant="danger" compact busy={acknowledging === e.id} onPress={() => onAcknowledge(e.id)} />
          ) : null}
        </View>
      ))}

      <View style={styles.footer}>
        <Text variant="label">
          Nurse: <Text variant="bodyStrong">{infant.assignedNurse?.name ?? 'unassigned'}</Text>
        </Text>
        {canManage ? <Button label="Manage" variant="secondary" compact onPress={() => onManage(bed)} accessibilityLabel={`Manage bed ${bed.label}`} /> : null}
      </View>
    </View>
  );
}

const styles = StyleSheet.create({
  tile: { borderRadius: 14, padding: 14, gap: 10, minWidth: 280, flexGrow: 1 },
  empty: { borderWidth: 2, borderStyle: 'dashed', justifyContent: 'center', alignItems: 'flex-start', minHeight: 140 },
  head: { flexDirection: 'row', alignItems: 'center', gap: 12 },
  bed: { minWidth: 76 },
  who: { flexShrink: 1, gap: 2 },
  countdown: { borderRadius: 10, paddingHorizontal: 12, paddingVertical: 6, flexDirection: 'row', alignItems: 'center', gap: 10 },
  countdownText: { flexShrink: 1 },
  values: { flexDirection: 'row', gap: 16 },
  value: { flex: 1, gap: 0 },
  badges: { flexDirection: 'row', flexWrap: 'wrap', gap: 6 },
  escalation: { borderWidth: 2, borderRadius: 10, padding: 8, gap: 8, flexDirection: 'row', flexWrap: 'wrap', alignItems: 'center', justifyContent: 'space-between' },
  footer: { flexDirection: 'row', alignItems: 'center', justifyContent: 'space-between', gap: 8, flexWrap: 'wrap' },
});
