import { useState } from 'react';
import { View, type LayoutChangeEvent } from 'react-native';
import { VictoryArea, VictoryAxis, VictoryChart, VictoryLine, VictoryScatter } from 'victory-native';
import { NORMAL_MAX_CENTI, NORMAL_MIN_CENTI, fromCentiCelsius, type TempUnit } from '@/shared/thermal';
import type { Flowsheet } from '@/shared/types/bedside';
import { useTheme } from '@/components/theme/theme-provider';
import { Text } from '@/components/ui/text';
import { clockTime, FLAG_LABELS, temp } from './format';

/** Probe, remote site and set temperature over the window, the normal band shaded, gap flags marked. */
export function TrendChart({ sheet, unit, clock }: { sheet: Flowsheet; unit: TempUnit; clock: '24h' | '12h' }) {
  const { colors } = useTheme();
  const [width, setWidth] = useState(340);
  const v = (centi: number) => fromCentiCelsius(centi, unit);
  const tz = sheet.infant.timeZone;
  const rows = [...sheet.readings].reverse();
  const series = (pick: (r: (typeof rows)[number]) => number | null) =>
    rows.filter((r) => pick(r) !== null).map((r) => ({ x: new Date(r.takenAt), y: v(pick(r)!) }));
  const probe = series((r) => r.probeCenti);
  const remote = series((r) => r.remoteCenti);
  const set = series((r) => r.setCenti);
  const from = new Date(sheet.from);
  const to = new Date(sheet.to);
  const gaps = sheet.flags
    .filter((f) => f.kind === 'gap')
    .map((f) => ({ x: new Date(f.raisedAt), y: v(Number((f.detail as { remoteCenti?: number }).remoteCenti ?? NORMAL_MIN_CENTI)) }));
  const all = [...probe, ...remote, ...set].map((p) => p.y);
  const lo = Math.min(v(3550), ...all) - 0.2;
  const hi = Math.max(v(3800), ...all) + 0.2;
  const latest = sheet.readings[0];
  const openGaps = sheet.flags.filter((f) => f.kind === 'gap' && f.status === 'open').length;

  return (
    <View onLayout={(e: LayoutChangeEvent) => setWidth(Math.max(280, e.nativeEvent.layout.width))}>
      <View accessibilityElementsHidden importantForAccessibility="no-hide-descendants" aria-hidden>
        <VictoryChart width={width} height={240} scale={{ x: 'time' }} domain={{ x: [from, to], y: [lo, hi] }} padding={{ top: 12, bottom: 36, left: 48, right: 16 }}>
          <VictoryArea
            data={[
              { x: from, y: v(NORMAL_MAX_CENTI), y0: v(NORMAL_MIN_CENTI) },
              { x: to, y: v(NORMAL_MAX_CENTI), y0: v(NORMAL_MIN_CENTI) },
            ]}
            style={{ data: { fill: colors.band, opacity: 0.7 } }}
          />
          <VictoryAxis tickFormat={(d: Date) => clockTime(d, tz, clock)} tickCount={4} style={{ tickLabels: { fill: colors.textMuted, fontSize: 11 }, axis: { stroke: colors.border } }} />
          <VictoryAxis dependentAxis tickFormat={(d: number) => d.toFixed(1)} style={{ tickLabels: { fill: colors.textMuted, fontSize: 11 }, axis: { stroke: colors.border }, grid: { stroke: colors.border, opacity: 0.2 } }} />
          {set.length > 1 ? <VictoryLine data={set} style={{ data: { stroke: colors.seriesSet, strokeDasharray: '4,4', strokeWidth: 1.5 } }} /> : null}
          {probe.length > 1 ? <VictoryLine data={probe} style={{ data: { stroke: colors.seriesProbe, strokeWidth: 2 } }} /> : null}
          <VictoryScatter data={probe} size={3} style={{ data: { fill: colors.seriesProbe } }} />
          {remote.length > 1 ? <VictoryLine data={remote} style={{ data: { stroke: colors.seriesRemote, strokeWidth: 2 } }} /> : null}
          <VictoryScatter data={remote} size={3} symbol="diamond" style={{ data: { fill: colors.seriesRemote } }} />
          <VictoryScatter data={gaps} size={7} symbol="triangleUp" style={{ data: { fill: colors.danger } }} />
        </VictoryChart>
      </View>
      <Text variant="caption" tone="muted">
        Lines: probe (solid, round points), remote site (diamonds), set temperature (dashed). Shaded: the normal band {temp(NORMAL_MIN_CENTI, unit)}–{temp(NORMAL_MAX_CENTI, unit)}. Red triangles: gap flags.
      </Text>
      <Text variant="caption" accessibilityLiveRegion="polite">
        {latest
          ? `Latest at ${clockTime(latest.takenAt, tz, clock)}: probe ${temp(latest.probeCenti, unit)}, remote site ${temp(latest.remoteCenti, unit)}, set ${temp(latest.setCenti, unit)}. `
          : 'No readings in this window. '}
        {openGaps ? `${openGaps} open ${FLAG_LABELS.gap.toLowerCase()}${openGaps > 1 ? 's' : ''}.` : 'No open gap flag.'}
      </Text>
    </View>
  );
}
