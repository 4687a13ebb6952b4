import { StyleSheet, View, type TextStyle } from 'react-native';
import { Button } from '@/components/ui/button';
import { Icon } from '@/components/ui/icon';
import type { ClockSetting } from '@/components/ui/format-time';
import { StatusBadge } from '@/components/ui/status-badge';
import { Text } from '@/components/ui/text';
import { useTheme } from '@/components/theme/theme-provider';
import { WarmingLine } from '@/components/unit-shift/warming';
import { CONTROL_MODE_LABELS, HEAT_SOURCE_LABELS } from '@/shared/vocabulary';
import { SEVERITY_RANK } from '@/shared/thermal/severity';
import { formatTemperature, type TempUnit } from '@/shared/thermal/units';
import type { BedWarming } from '@/shared/schemas/warming';
import type { BoardBed } from '@/shared/types/board';
import { ageOf, clockTime, countdown } from './board-format';
import { escalationLine, flagLook } from './flag-look';
import { placementShort } from '@/components/bedside/placement-values';

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

/** How large the tile draws: a phone's list, a 1440-wide wall or a 1920-wide wall. */
export type WallScale = 'phone' | 'medium' | 'large';

/** Type sizes per scale: across the room at 1920x1080 the bed and countdown at 32 px or more, flag words at 20 px or more. */
const SIZES: Record<WallScale, { bed: number; countdown: number; name: number; flag: number; line: number; icon: number }> = {
  phone: { bed: 34, countdown: 34, name: 20, flag: 17, line: 15, icon: 26 },
  medium: { bed: 24, countdown: 22, name: 16, flag: 15, line: 13, icon: 20 },
  large: { bed: 38, countdown: 36, name: 22, flag: 21, line: 16, icon: 28 },
};

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
  /** A fixed height on the wall (every tile the same); the phone's list lets each tile be as tall as it needs. */
  height?: number;
  scale?: WallScale;
  warming?: BedWarming;
}

/** One bed, readable from across the room: the bed, the countdown and the flags in display type. */
export function BoardTile({ bed, nowMs, tempUnit, timeZone, clock, dueSoonMinutes, canManage, acknowledging, onManage, onAcknowledge, width, height, scale = 'phone', warming }: BoardTileProps) {
  const theme = useTheme();
  const c = theme.colors;
  const size = SIZES[scale];
  const infant = bed.infant;
  const edge = bed.tier === 0 ? c.danger : bed.tier === 1 ? c.warning : c.border;
  const box = { width, ...(height ? { height, overflow: 'hidden' as const } : null) };
  const bedStyle: TextStyle = { fontSize: size.bed, lineHeight: Math.round(size.bed * 1.15) };

  if (!infant) {
    return (
      <View
        role="listitem"
        style={[styles.tile, styles.empty, box, { borderColor: warming ? c.warning : c.border, backgroundColor: c.background }]}
        aria-label={`Bed ${bed.label}, empty${warming ? ', warming for an admission' : ''}`}
        testID={`bed-${bed.label}`}
      >
        <Text variant="display" style={bedStyle} testID="bed-label">
          {bed.label}
        </Text>
        <Text tone="muted" variant="bodyStrong">
          Empty bed
        </Text>
        {warming ? <WarmingLine warming={warming} tempUnit={tempUnit} timeZone={timeZone} clock={clock} nowMs={nowMs} /> : null}
        {canManage ? <Button label={`Admit to ${bed.label}`} icon="plus" variant="secondary" compact onPress={() => onManage(bed)} /> : null}
      </View>
    );
  }

  const next = infant.checks?.next ?? infant.nextCheck;
  const due = countdown(next.dueAt, nowMs, dueSoonMinutes);
  const caption = clockCaption(infant, clock);
  const probe = infant.latest.probe;
  const remote = infant.latest.remote;
  const dueColour = due.tone === 'danger' ? c.danger : due.tone === 'warning' ? c.warning : c.text;
  const lineStyle: TextStyle = { fontSize: size.line, lineHeight: Math.round(size.line * 1.35) };
  return (
    <View
      role="listitem"
      style={[styles.tile, box, { borderColor: edge, borderWidth: bed.tier <= 1 ? 4 : 2, backgroundColor: c.surface }]}
      aria-label={`Bed ${bed.label}, ${infant.displayName}`}
      testID={`bed-${bed.label}`}
    >
      <View style={styles.head}>
        <Text variant="display" style={[styles.bed, bedStyle]} testID="bed-label">
          {bed.label}
        </Text>
        <View style={styles.headEnd}>
          {infant.assignedNurse ? null : <StatusBadge tone="warning" icon="users" label="No nurse assigned" />}
          {canManage ? <Button label="Manage" variant="secondary" compact onPress={() => onManage(bed)} accessibilityLabel={`Manage bed ${bed.label}`} /> : null}
        </View>
      </View>
      <View style={styles.who}>
        <Text variant="title" numberOfLines={1} style={{ fontSize: size.name, lineHeight: Math.round(size.name * 1.3) }}>
          {infant.displayName}
          {infant.assignedNurse ? <Text variant="label" tone="muted" style={lineStyle}>{`  · ${infant.assignedNurse.name}`}</Text> : null}
        </Text>
      </View>

      <View style={[styles.countdown, { backgroundColor: due.tone === 'danger' ? c.dangerSoft : due.tone === 'warning' ? c.warningSoft : c.surfaceSunken }]}>
        {/* The word says the state; the icon and colour repeat it for a glance across the room. */}
        <Icon name={due.icon} size={size.icon} color={dueColour} />
        <Text
          variant="display"
          style={[styles.countdownText, { color: dueColour, fontSize: size.countdown, lineHeight: Math.round(size.countdown * 1.15) }]}
          accessibilityLiveRegion="none"
          testID="bed-countdown"
        >
          {due.text}
        </Text>
      </View>
      {caption ? (
        <Text variant="label" tone={due.tone === 'danger' ? 'danger' : 'muted'} style={lineStyle}>
          {caption}
        </Text>
      ) : null}

      {/* Before the flags: on a full wall tile the Acknowledge button must never be cut off. */}
      {/* Only an escalation that went out is shown: "escalated" must name whom it reached. */}
      {/* An acknowledged one moves below the flags: on a fixed-height tile the flag words matter more. */}
      {bed.escalations.filter((e) => e.sentAt && !e.acknowledgedAt).map((e) => (
        <View key={e.id} style={[styles.escalation, { borderColor: e.acknowledgedAt ? c.border : c.danger }]}>
          <Text variant="label" tone={e.acknowledgedAt ? 'muted' : 'danger'} style={[lineStyle, styles.escalationText]}>
            {escalationLine({ id: e.id, sentAt: e.sentAt!, to: e.to, how: 'email', acknowledgedAt: e.acknowledgedAt, acknowledgedBy: e.acknowledgedBy }, timeZone, clock)}
          </Text>
          {!e.acknowledgedAt && canManage ? (
            <Button label="Acknowledge" variant="danger" compact busy={acknowledging === e.id} onPress={() => onAcknowledge(e.id)} />
          ) : null}
        </View>
      ))}

      {infant.openFlags.length || infant.skinToSkin ? (
        <View style={styles.flags}>
          {/* Most severe first, as the board orders the beds: a clipped wall tile loses the mildest. */}
          {[...infant.openFlags].sort((a, b) => SEVERITY_RANK[b.severity ?? 'caution'] - SEVERITY_RANK[a.severity ?? 'caution']).map((f) => {
            const look = flagLook(f);
            const colour = look.tone === 'danger' ? c.danger : look.tone === 'warning' ? c.warning : c.text;
            return (
              <View key={f.key} style={styles.flag}>
                <Icon name={look.icon} size={size.icon - 4} color={colour} />
                <Text variant="bodyStrong" style={{ color: colour, fontSize: size.flag, lineHeight: Math.round(size.flag * 1.25), flexShrink: 1 }} testID="bed-flag">
                  {look.label}
                </Text>
              </View>
            );
          })}
          {infant.skinToSkin ? <StatusBadge tone="together" icon="hands" label={`Skin-to-skin since ${clockTime(infant.skinToSkin.startedAt, timeZone, clock)}`} large /> : null}
        </View>
      ) : null}
      {/* An acknowledged escalation a later one of the same flag (it worsened) stands in for is left out. */}
      {bed.escalations.filter((e, _, all) => e.sentAt && e.acknowledgedAt && !all.some((l) => l.flagId === e.flagId && l.sentAt && l.escalatedAt > e.escalatedAt)).map((e) => (
        <Text key={e.id} variant="label" tone="muted" style={lineStyle} numberOfLines={height ? 2 : undefined}>
          {escalationLine({ id: e.id, sentAt: e.sentAt!, to: e.to, how: 'email', acknowledgedAt: e.acknowledgedAt, acknowledgedBy: e.acknowledgedBy }, timeZone, clock)}
        </Text>
      ))}

      <Text variant="label" tone="muted" style={lineStyle}>
        Probe {probe ? `${formatTemperature(probe.centi, tempUnit)} (${ageOf(probe.takenAt, nowMs)})` : 'none charted'} · remote site
        {remote?.site ? ` (${remote.site})` : ''} {remote ? `${formatTemperature(remote.centi, tempUnit)} (${ageOf(remote.takenAt, nowMs)})` : 'none charted'}
      </Text>
      {/* The stored placement and its prompt (never judged here); nothing while none is charted. */}
      {infant.placement?.prompt ? (
        <Text variant="label" tone="danger" style={lineStyle} numberOfLines={height ? 1 : undefined} testID="bed-placement-prompt">
          Move the probe: it lies under the infant ({placementShort(infant.placement)})
        </Text>
      ) : infant.placement ? (
        <Text variant="label" tone="muted" style={lineStyle} numberOfLines={height ? 1 : undefined}>
          Probe {placementShort(infant.placement)}
        </Text>
      ) : null}
      <Text variant="label" tone="muted" style={lineStyle}>
        {infant.gestationWeeks}+{infant.gestationDays} wk · {infant.weightGrams} g · {HEAT_SOURCE_LABELS[infant.heatSource]} · {infant.controlMode ? CONTROL_MODE_LABELS[infant.controlMode] : 'mode not charted'}
        {infant.setCenti !== null ? ` · set ${formatTemperature(infant.setCenti, tempUnit)}` : ''}
      </Text>
    </View>
  );
}

const styles = StyleSheet.create({
  tile: { borderRadius: 14, padding: 12, gap: 8 },
  empty: { borderWidth: 2, borderStyle: 'dashed', justifyContent: 'flex-start', alignItems: 'flex-start', minHeight: 140 },
  head: { flexDirection: 'row', alignItems: 'center', gap: 10 },
  headEnd: { flex: 1, flexDirection: 'row', justifyContent: 'flex-end', alignItems: 'center', gap: 6, flexWrap: 'wrap' },
  bed: { minWidth: 56 },
  who: { minWidth: 0 },
  countdown: { borderRadius: 10, paddingHorizontal: 10, paddingVertical: 4, flexDirection: 'row', alignItems: 'center', gap: 10 },
  countdownText: { flexShrink: 1 },
  flags: { gap: 4 },
  flag: { flexDirection: 'row', alignItems: 'center', gap: 6 },
  escalation: { borderWidth: 2, borderRadius: 10, padding: 6, gap: 6, flexDirection: 'row', flexWrap: 'wrap', alignItems: 'center', justifyContent: 'space-between' },
  escalationText: { flexShrink: 1 },
});
