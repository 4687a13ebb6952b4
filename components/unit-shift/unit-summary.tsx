import { StyleSheet, View } from 'react-native';
import { clockTime, countdown } from '@/components/board/board-format';
import { flagLook } from '@/components/board/flag-look';
import type { ClockSetting } from '@/components/ui/format-time';
import { Text } from '@/components/ui/text';
import { useTheme } from '@/components/theme/theme-provider';
import { SEVERITY_RANK } from '@/shared/thermal/severity';
import { formatTemperature, type TempUnit } from '@/shared/thermal/units';
import type { HandoverInfant } from '@/shared/types/board';
import type { HandoverPlan } from '@/shared/schemas/shift-work';
import { placementShort } from '@/components/bedside/placement-values';

/** The next check in words: "overdue by 55 min", never a clock-like countdown. */
export function nextCheckWords(h: HandoverInfant, nowMs: number, timeZone: string, clock: ClockSetting): string {
  const due = h.checks?.next?.dueAt ?? h.nextCheck.dueAt;
  if (!due) return 'No remote-site check charted';
  // The board's own countdown ("Overdue by 1 h 22 min"), so the printout and the wall agree.
  return `${countdown(due, nowMs, 0).text} (due ${clockTime(due, timeZone, clock, nowMs)})`;
}

/**
 * The first printed page of the unit handover: one row per bed with the infant, the open
 * concerns most severe first, the next check and the remote site charted last, and whether a plan
 * was written. The per-infant pages follow.
 */
export function UnitSummary({
  handovers,
  plans,
  tempUnit,
  timeZone,
  clock,
  nowMs,
}: {
  handovers: HandoverInfant[];
  plans: HandoverPlan[];
  tempUnit: TempUnit;
  timeZone: string;
  clock: ClockSetting;
  nowMs: number;
}) {
  const { colors } = useTheme();
  const planned = new Set(plans.map((p) => p.infantId));
  return (
    <View role="table" aria-label="Unit summary, one row per bed" style={styles.table}>
      <View role="row" style={[styles.row, { borderColor: colors.border }]}>
        {['Bed · infant', 'Open concerns, most severe first', 'Next check', 'Latest'].map((h, i) => (
          <Text key={h} role="columnheader" variant="label" style={i === 1 ? styles.wideCell : styles.cell}>
            {h}
          </Text>
        ))}
      </View>
      {handovers.map((h) => {
        const open = h.flags.filter((f) => f.closedAt === null && !f.withdrawn).sort((a, b) => SEVERITY_RANK[b.severity ?? 'urgent'] - SEVERITY_RANK[a.severity ?? 'urgent']);
        return (
          <View key={h.infant.id} role="row" style={[styles.row, { borderColor: colors.border }]} data-print-block>
            <View role="cell" style={styles.cell}>
              <Text variant="bodyStrong">
                {h.infant.bedLabel ?? '—'} · {h.infant.displayName}
              </Text>
              <Text variant="caption" tone="muted">
                {h.nurse ? h.nurse.name : 'No nurse assigned'}
                {planned.has(h.infant.id) ? ' · plan written' : ' · no plan yet'}
              </Text>
            </View>
            <View role="cell" style={styles.wideCell}>
              {open.length === 0 ? <Text>No open flags</Text> : open.map((f) => <Text key={f.id}>{flagLook(f).label}</Text>)}
              {h.settings.placement?.prompt ? <Text tone="danger">Move the probe: it lies under the infant</Text> : null}
            </View>
            <Text role="cell" style={styles.cell}>
              {nextCheckWords(h, nowMs, timeZone, clock)}
            </Text>
            <Text role="cell" style={styles.cell}>
              {h.settings.probeCenti !== null ? `Probe ${formatTemperature(h.settings.probeCenti, tempUnit)}` : 'Probe —'}
              {' · '}
              {h.settings.remoteCenti !== null ? `remote ${formatTemperature(h.settings.remoteCenti, tempUnit)}` : 'remote —'}
              {(() => {
                const site = h.readings.find((r) => r.remoteSite)?.remoteSite;
                return site ? ` (${site})` : '';
              })()}
              {h.settings.placement ? `\nProbe ${placementShort(h.settings.placement) ?? 'placement not charted'}` : ''}
            </Text>
          </View>
        );
      })}
    </View>
  );
}

const styles = StyleSheet.create({
  table: { gap: 0 },
  row: { flexDirection: 'row', gap: 8, paddingVertical: 6, borderBottomWidth: 1 },
  cell: { flex: 1, minWidth: 0 },
  wideCell: { flex: 1.6, minWidth: 0 },
});
