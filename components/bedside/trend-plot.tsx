import { NORMAL_MAX_CENTI, NORMAL_MIN_CENTI } from '@/shared/thermal/bands';
import { fromCentiCelsius, type TempUnit } from '@/shared/thermal/units';
import type { Flowsheet } from '@/shared/types/bedside';
import { useTheme } from '@/components/theme/theme-provider';
import { timeAxis } from './time-axis';
import { VictoryArea, VictoryAxis, VictoryChart, VictoryLine, VictoryScatter } from './victory';

export interface TrendPlotProps {
  sheet: Flowsheet;
  unit: TempUnit;
  clock: '24h' | '12h';
  width: number;
  /** Set by trend-chart.tsx, which reserves a box of this height before this module has loaded. */
  height: number;
}

/**
 * The drawing of the trend: probe, remote site and set temperature over the window, the normal
 * band shaded, gap flags marked. Loaded lazily through chart-plots.ts; the words that say the
 * same thing stay in trend-chart.tsx, which renders at once.
 */
export function TrendPlot({ sheet, unit, clock, width, height }: TrendPlotProps) {
  const { colors } = useTheme();
  const v = (centi: number) => fromCentiCelsius(centi, unit);
  const tz = sheet.infant.timeZone;
  const rows = [...sheet.readings].reverse();
  const series = (pick: (r: (typeof rows)[number]) => number | null) => rows.filter((r) => pick(r) !== null).map((r) => ({ x: new Date(r.takenAt), y: v(pick(r)!) }));
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
  // The unit's days: a dashed line at each midnight, and the day named under the ticks that start one.
  const axis = timeAxis(from, to, tz, clock);

  return (
    <VictoryChart
      width={width}
      height={height}
      scale={{ x: 'time' }}
      domain={{ x: [from, to], y: [lo, hi] }}
      padding={{ top: 12, bottom: axis.crossesMidnight ? 50 : 36, left: 48, right: 16 }}
    >
      <VictoryArea
        data={[
          { x: from, y: v(NORMAL_MAX_CENTI), y0: v(NORMAL_MIN_CENTI) },
          { x: to, y: v(NORMAL_MAX_CENTI), y0: v(NORMAL_MIN_CENTI) },
        ]}
        style={{ data: { fill: colors.band, opacity: 0.7 } }}
      />
      {axis.midnights.map((midnight) => (
        <VictoryLine
          key={midnight.getTime()}
          data={[
            { x: midnight, y: lo },
            { x: midnight, y: hi },
          ]}
          style={{ data: { stroke: colors.textMuted, strokeDasharray: '2,4', strokeWidth: 1 } }}
        />
      ))}
      <VictoryAxis
        tickFormat={(d: Date, i: number, ticks: Date[]) =>
          axis.label(
            new Date(d),
            i,
            ticks.map((t) => new Date(t)),
          )
        }
        tickCount={4}
        style={{ tickLabels: { fill: colors.textMuted, fontSize: 11 }, axis: { stroke: colors.border } }}
      />
      <VictoryAxis
        dependentAxis
        tickFormat={(d: number) => d.toFixed(1)}
        style={{ tickLabels: { fill: colors.textMuted, fontSize: 11 }, axis: { stroke: colors.border }, grid: { stroke: colors.border, opacity: 0.2 } }}
      />
      {set.length > 1 ? <VictoryLine data={set} style={{ data: { stroke: colors.seriesSet, strokeDasharray: '4,4', strokeWidth: 1.5 } }} /> : null}
      {probe.length > 1 ? <VictoryLine data={probe} style={{ data: { stroke: colors.seriesProbe, strokeWidth: 2 } }} /> : null}
      <VictoryScatter data={probe} size={3} style={{ data: { fill: colors.seriesProbe } }} />
      {remote.length > 1 ? <VictoryLine data={remote} style={{ data: { stroke: colors.seriesRemote, strokeWidth: 2 } }} /> : null}
      <VictoryScatter data={remote} size={3} symbol="diamond" style={{ data: { fill: colors.seriesRemote } }} />
      <VictoryScatter data={gaps} size={7} symbol="triangleUp" style={{ data: { fill: colors.danger } }} />
    </VictoryChart>
  );
}
