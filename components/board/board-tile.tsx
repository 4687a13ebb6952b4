import { useLayoutEffect, useRef, useState } from 'react';
import { Platform, StyleSheet, View, type TextStyle } from 'react-native';
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

/**
 * Which check the countdown is for, in words, when it is not the routine remote-site check.
 * `short` (a wall tile) leaves out why: the phone's list has room for it.
 */
export function clockCaption(infant: NonNullable<BoardBed['infant']>, clock: ClockSetting, short = false): string | null {
  const next = infant.checks?.next;
  const manual = infant.checks?.manual;
  if (next?.clock === 'manual' && manual) {
    const output = manual.outputPct !== null ? ` at ${manual.outputPct} % output` : '';
    const why = short ? '' : 'nothing regulates the heat, so ';
    return `Manual mode since ${clockTime(manual.since, infant.timeZone, clock)}${output}: ${why}check every ${manual.limitMinutes} min`;
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
  large: { bed: 36, countdown: 34, name: 22, flag: 21, line: 16, icon: 28 },
};

export interface BoardTileProps {
  bed: BoardBed;
  nowMs: number;
  tempUnit: TempUnit;
  timeZone: string;
  clock: ClockSetting;
  dueSoonMinutes: number;
  canManage: boolean;
  /** The escalations being acknowledged now. */
  acknowledging: readonly string[];
  onManage: (bed: BoardBed) => void;
  /** Acknowledge these escalations (one, or every one told in the same words at once). */
  onAcknowledge: (escalationIds: string[]) => void;
  width: number | `${number}%`;
  /** A fixed height on the wall (every tile the same); the phone's list lets each tile be as tall as it needs. */
  height?: number;
  scale?: WallScale;
  warming?: BedWarming;
}

/** One bed, readable from across the room: the bed, the countdown and the flags in display type. */
export function BoardTile(props: BoardTileProps) {
  return props.bed.infant ? <InfantTile {...props} infant={props.bed.infant} /> : <EmptyTile {...props} />;
}

function EmptyTile({ bed, nowMs, tempUnit, timeZone, clock, canManage, onManage, width, height, scale = 'phone', warming }: BoardTileProps) {
  const c = useTheme().colors;
  const size = SIZES[scale];
  return (
    <View
      role="listitem"
      style={[
        styles.tile,
        styles.empty,
        scale !== 'phone' && styles.emptyWall,
        tileBox(width, height),
        { borderColor: warming ? c.warning : c.border, backgroundColor: c.background },
      ]}
      aria-label={`Bed ${bed.label}, empty${warming ? ', warming for an admission' : ''}`}
      testID={`bed-${bed.label}`}
      // react-native-web writes data-empty-bed: the board measures its empty beds by it.
      {...({ dataSet: { emptyBed: 'true' } } as object)}
    >
      {/* On the wall the label and "Empty bed" share a line: an empty bed needs less room than an infant. */}
      <View style={scale === 'phone' ? null : styles.emptyHead}>
        <Text variant="display" style={{ fontSize: size.bed, lineHeight: Math.round(size.bed * 1.15) }} testID="bed-label">
          {bed.label}
        </Text>
        <Text tone="muted" variant="bodyStrong">
          Empty bed
        </Text>
      </View>
      {warming ? <WarmingLine warming={warming} tempUnit={tempUnit} timeZone={timeZone} clock={clock} nowMs={nowMs} /> : null}
      {canManage ? <Button label={`Admit to ${bed.label}`} icon="plus" variant="secondary" compact onPress={() => onManage(bed)} /> : null}
    </View>
  );
}

/** A wall tile has one fixed size: its box hides what does not fit (the fitting below decides what that is). */
function tileBox(width: BoardTileProps['width'], height: number | undefined) {
  return { width, ...(height ? { height, overflow: 'hidden' as const } : null) };
}

/**
 * How many of `steps` optional parts a fixed-height tile must leave out so that what it shows
 * fits whole: never a line cut in half at the tile's edge. Measured in the browser after each
 * render (before the paint): while the content is taller than the tile, one more part goes. It
 * starts again from nothing left out whenever `fitKey` (what the tile says, its size) changes.
 */
function useFit(fitKey: string, steps: number, active: boolean) {
  const tile = useRef<View>(null);
  const content = useRef<View>(null);
  const [fit, setFit] = useState({ key: fitKey, level: 0 });
  const level = fit.key === fitKey ? fit.level : 0;
  // Runs after every render: the check is two reads of the layout, and setFit keeps the old
  // object (so React stops there) unless one more part must go or what the tile says changed.
  // (Cascading renders are the point: each runs before the paint, and they stop once it fits.)
  // eslint-disable-next-line react-hooks/exhaustive-deps
  useLayoutEffect(() => {
    if (!active || Platform.OS !== 'web' || !tile.current || !content.current) return;
    const box = tile.current as unknown as HTMLElement;
    const style = getComputedStyle(box);
    const room = box.clientHeight - parseFloat(style.paddingTop) - parseFloat(style.paddingBottom);
    const over = (content.current as unknown as HTMLElement).getBoundingClientRect().height > room + 0.5;
    const next = { key: fitKey, level: over && level < steps ? level + 1 : level };
    setFit((f) => (f.key === next.key && f.level === next.level ? f : next));
  });
  return { tile, content, level };
}

/** "+3 more flags": what a full wall tile left out, in words. */
export function moreFlagsWords(count: number): string {
  return `+${count} more ${count === 1 ? 'flag' : 'flags'}`;
}

function InfantTile({
  bed,
  infant,
  nowMs,
  tempUnit,
  timeZone,
  clock,
  dueSoonMinutes,
  canManage,
  acknowledging,
  onManage,
  onAcknowledge,
  width,
  height,
  scale = 'phone',
}: BoardTileProps & { infant: NonNullable<BoardBed['infant']> }) {
  const theme = useTheme();
  const c = theme.colors;
  const size = SIZES[scale];
  const wall = height !== undefined;
  const edge = bed.tier === 0 ? c.danger : bed.tier === 1 ? c.warning : c.border;
  const bedStyle: TextStyle = { fontSize: size.bed, lineHeight: Math.round(size.bed * 1.15) };
  const next = infant.checks?.next ?? infant.nextCheck;
  const due = countdown(next.dueAt, nowMs, dueSoonMinutes);
  const caption = clockCaption(infant, clock, wall);
  const probe = infant.latest.probe;
  const remote = infant.latest.remote;
  const dueColour = due.tone === 'danger' ? c.danger : due.tone === 'warning' ? c.warning : c.text;
  const lineStyle: TextStyle = { fontSize: size.line, lineHeight: Math.round(size.line * 1.35) };
  // Most severe first, as the board orders the beds: a full wall tile leaves the mildest out.
  const flags = [...infant.openFlags].sort((a, b) => SEVERITY_RANK[b.severity ?? 'caution'] - SEVERITY_RANK[a.severity ?? 'caution']);
  // Escalations told in the same words at the same minute are one line with one Acknowledge.
  const told = new Map<string, string[]>();
  for (const e of bed.escalations) {
    if (!e.sentAt || e.acknowledgedAt) continue;
    const full = escalationLine({ id: e.id, sentAt: e.sentAt, to: e.to, how: 'email', acknowledgedAt: null, acknowledgedBy: null }, timeZone, clock)!;
    // On a wall tile "by e-mail" goes (every escalation is mailed): the button beside it needs the room.
    const line = wall ? full.replace(/ by e-mail$/, '') : full;
    told.set(line, [...(told.get(line) ?? []), e.id]);
  }
  // An acknowledged escalation a later one of the same flag (it worsened) stands in for is left out.
  const acknowledged = bed.escalations.filter((e, _, all) => e.sentAt && e.acknowledgedAt && !all.some((l) => l.flagId === e.flagId && l.sentAt && l.escalatedAt > e.escalatedAt));
  // Told and acknowledged in the same words: one line, saying for how many flags. A crowded wall
  // tile first shortens it to the acknowledgement alone ("Acknowledged by … at 04:39").
  const answered = new Map<string, number>();
  const answeredShort = new Map<string, number>();
  for (const e of acknowledged) {
    const line = escalationLine({ id: e.id, sentAt: e.sentAt!, to: e.to, how: 'email', acknowledgedAt: e.acknowledgedAt, acknowledgedBy: e.acknowledgedBy }, timeZone, clock)!;
    const words = wall ? line.replace(' by e-mail;', ';') : line;
    answered.set(words, (answered.get(words) ?? 0) + 1);
    const short = `Acknowledged by ${e.acknowledgedBy?.name ?? 'the charge nurse'} at ${clockTime(e.acknowledgedAt!, timeZone, clock)}`;
    answeredShort.set(short, (answeredShort.get(short) ?? 0) + 1);
  }

  // What a full wall tile leaves out, first to last: the bed, the infant, the countdown and an
  // escalation to acknowledge always stay, and so does the most severe flag until nothing else is left.
  // (An acknowledged escalation outlasts the latest temperatures and the milder flags, which "+N more
  // flags" still counts, and, shortened to the acknowledgement alone, the clock's caption: the
  // charge nurse who pressed Acknowledge must see that it was taken.)
  const optional: string[] = ['equipment'];
  if (infant.placement && !infant.placement.prompt) optional.push('placement');
  optional.push('probe');
  if (infant.skinToSkin) optional.push('skin');
  for (const f of flags.slice(1).reverse()) optional.push(`flag:${f.key}`);
  if (acknowledged.length) optional.push('acknowledged-told');
  if (caption) optional.push('caption');
  if (acknowledged.length) optional.push('acknowledged');
  if (infant.placement?.prompt) optional.push('prompt');
  if (flags[0]) optional.push(`flag:${flags[0].key}`);
  // Last of all the escalations' words: one Acknowledge for them all stays.
  if (told.size) optional.push('told');
  const fitKey = `${String(width)}x${height}:${scale}:${due.text}:${caption}:${JSON.stringify(bed)}`;
  const { tile: tileRef, content: contentRef, level } = useFit(fitKey, optional.length, wall);
  const hidden = new Set(optional.slice(0, level));
  const shownFlags = flags.filter((f) => !hidden.has(`flag:${f.key}`));
  const leftOut = flags.length - shownFlags.length;

  return (
    <View
      ref={tileRef}
      role="listitem"
      style={[
        styles.tile,
        tileBox(width, height),
        { borderColor: edge, borderWidth: bed.tier <= 1 ? 4 : 2, backgroundColor: c.surface },
        wall && styles.wallTile,
        scale === 'medium' && styles.mediumTile,
      ]}
      aria-label={`Bed ${bed.label}, ${infant.displayName}, ${infant.assignedNurse ? `nurse ${infant.assignedNurse.name}` : 'no nurse assigned'}`}
      testID={`bed-${bed.label}`}
    >
      <View ref={contentRef} style={[styles.content, wall && styles.wallContent, scale === 'medium' && styles.mediumContent]}>
        {/* The bed and its nurse beside Manage (an unassigned bed is marked there), the infant below at the full width. */}
        <View style={styles.head}>
          <View style={styles.labelRow}>
            <Text variant="display" style={[styles.bed, bedStyle]} testID="bed-label">
              {bed.label}
            </Text>
            {infant.assignedNurse ? (
              <View style={styles.nurse}>
                <Icon name="users" size={lineStyle.fontSize! + 2} color={c.textMuted} />
                <Text variant="label" tone="muted" numberOfLines={1} style={[lineStyle, styles.nurseName]}>
                  {infant.assignedNurse.name}
                </Text>
              </View>
            ) : (
              <StatusBadge tone="warning" icon="users" label={wall ? 'No nurse' : 'No nurse assigned'} />
            )}
          </View>
          {canManage ? <Button label="Manage" variant="secondary" compact onPress={() => onManage(bed)} accessibilityLabel={`Manage bed ${bed.label}`} /> : null}
        </View>
        <Text variant="title" numberOfLines={1} style={{ fontSize: size.name, lineHeight: Math.round(size.name * 1.3) }}>
          {infant.displayName}
        </Text>

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
        {caption && !hidden.has('caption') ? (
          <Text variant="label" tone={due.tone === 'danger' ? 'danger' : 'muted'} style={lineStyle}>
            {caption}
          </Text>
        ) : null}

        {/* Before the flags: on a full wall tile the Acknowledge button must never be left out. */}
        {/* Only an escalation that went out is shown: "escalated" must name whom it reached. */}
        {hidden.has('told') ? (
          <Button
            label={told.size === 1 && [...told.values()][0]!.length === 1 ? 'Acknowledge' : `Acknowledge all ${[...told.values()].flat().length}`}
            variant="danger"
            compact
            busy={[...told.values()].flat().some((id) => acknowledging.includes(id))}
            onPress={() => onAcknowledge([...told.values()].flat())}
            style={styles.alone}
          />
        ) : (
          [...told].map(([line, ids]) => (
            <View key={ids[0]} style={[styles.escalation, wall ? styles.escalationWall : { borderColor: c.danger }, scale === 'large' && styles.escalationBeside]}>
              <Text variant="label" tone="danger" style={[lineStyle, styles.escalationText]}>
                {ids.length > 1 && !wall ? `${line} (${ids.length} flags)` : line}
              </Text>
              {canManage ? (
                <Button
                  label={ids.length > 1 ? `Acknowledge all ${ids.length}` : 'Acknowledge'}
                  variant="danger"
                  compact
                  busy={ids.some((id) => acknowledging.includes(id))}
                  onPress={() => onAcknowledge(ids)}
                />
              ) : null}
            </View>
          ))
        )}

        {shownFlags.length || leftOut || (infant.skinToSkin && !hidden.has('skin')) ? (
          <View style={styles.flags}>
            {shownFlags.map((f) => {
              const look = flagLook(f, wall);
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
            {leftOut ? (
              <Text variant="bodyStrong" style={{ fontSize: size.flag, lineHeight: Math.round(size.flag * 1.25) }} testID="bed-more-flags">
                {moreFlagsWords(leftOut)}
              </Text>
            ) : null}
            {infant.skinToSkin && !hidden.has('skin') ? (
              <StatusBadge tone="together" icon="hands" label={`Skin-to-skin since ${clockTime(infant.skinToSkin.startedAt, timeZone, clock)}`} large />
            ) : null}
          </View>
        ) : null}
        {hidden.has('acknowledged')
          ? null
          : [...(hidden.has('acknowledged-told') ? answeredShort : answered)].map(([line, count]) => (
              <Text key={line} variant="label" tone="muted" style={lineStyle}>
                {count > 1 ? `${line} (${count} flags)` : line}
              </Text>
            ))}

        {hidden.has('probe') ? null : (
          <Text variant="label" tone="muted" style={lineStyle}>
            Probe {probe ? `${formatTemperature(probe.centi, tempUnit)} (${ageOf(probe.takenAt, nowMs)})` : 'none charted'} · remote site
            {remote?.site ? ` (${remote.site})` : ''} {remote ? `${formatTemperature(remote.centi, tempUnit)} (${ageOf(remote.takenAt, nowMs)})` : 'none charted'}
          </Text>
        )}
        {/* The stored placement and its prompt (never judged here); nothing while none is charted. */}
        {infant.placement?.prompt && !hidden.has('prompt') ? (
          <Text variant="label" tone="danger" style={lineStyle} testID="bed-placement-prompt">
            Move the probe: it lies under the infant ({placementShort(infant.placement)})
          </Text>
        ) : infant.placement && !infant.placement.prompt && !hidden.has('placement') ? (
          <Text variant="label" tone="muted" style={lineStyle} numberOfLines={height ? 1 : undefined}>
            Probe {placementShort(infant.placement)}
          </Text>
        ) : null}
        {hidden.has('equipment') ? null : (
          <Text variant="label" tone="muted" style={lineStyle}>
            {infant.gestationWeeks}+{infant.gestationDays} wk · {infant.weightGrams} g · {HEAT_SOURCE_LABELS[infant.heatSource]} ·{' '}
            {infant.controlMode ? CONTROL_MODE_LABELS[infant.controlMode] : 'mode not charted'}
            {infant.setCenti !== null ? ` · set ${formatTemperature(infant.setCenti, tempUnit)}` : ''}
          </Text>
        )}
      </View>
    </View>
  );
}

const styles = StyleSheet.create({
  tile: { borderRadius: 14, padding: 12, gap: 8 },
  wallTile: { padding: 10 },
  mediumTile: { padding: 8 },
  content: { gap: 8 },
  wallContent: { gap: 6 },
  mediumContent: { gap: 4 },
  nurse: { flexDirection: 'row', alignItems: 'center', gap: 4, flexShrink: 1, minWidth: 0 },
  nurseName: { flexShrink: 1 },
  alone: { alignSelf: 'flex-start' },
  empty: { borderWidth: 2, borderStyle: 'dashed', justifyContent: 'flex-start', alignItems: 'flex-start', minHeight: 140 },
  emptyWall: { minHeight: 0, padding: 10 },
  emptyHead: { flexDirection: 'row', flexWrap: 'wrap', alignItems: 'baseline', columnGap: 10 },
  head: { flexDirection: 'row', alignItems: 'center', gap: 8 },
  labelRow: { flex: 1, minWidth: 0, flexDirection: 'row', flexWrap: 'wrap', alignItems: 'center', columnGap: 8, rowGap: 2 },
  bed: { minWidth: 56 },
  countdown: { borderRadius: 10, paddingHorizontal: 10, paddingVertical: 4, flexDirection: 'row', alignItems: 'center', gap: 10 },
  countdownText: { flexShrink: 1 },
  flags: { gap: 4 },
  flag: { flexDirection: 'row', alignItems: 'center', gap: 6 },
  escalation: { borderWidth: 2, borderRadius: 10, padding: 6, gap: 6, flexDirection: 'row', flexWrap: 'wrap', alignItems: 'center', justifyContent: 'space-between' },
  escalationWall: { borderWidth: 0, padding: 0, alignItems: 'flex-start', flexDirection: 'column' },
  escalationBeside: { flexDirection: 'row', alignItems: 'center', flexWrap: 'nowrap' },
  escalationText: { flexShrink: 1 },
});
