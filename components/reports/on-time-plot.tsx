import { useTheme } from '@/components/theme/theme-provider';
import { VictoryAxis, VictoryBar, VictoryChart } from '@/components/bedside/victory';

export interface OnTimePlotProps {
  data: { x: string; y: number }[];
  width: number;
  /** Set by on-time-chart.tsx, which reserves a box of this height before this module has loaded. */
  height: number;
}

/** On-time rate (%) as bars. Loaded lazily through components/bedside/chart-plots.ts, with the trend chart. */
export function OnTimePlot({ data, width, height }: OnTimePlotProps) {
  const { colors } = useTheme();
  return (
    <VictoryChart width={width} height={height} domain={{ y: [0, 100] }} domainPadding={{ x: 30 }} padding={{ top: 16, bottom: 40, left: 48, right: 16 }}>
      <VictoryAxis style={{ tickLabels: { fill: colors.textMuted, fontSize: 11 }, axis: { stroke: colors.border } }} />
      <VictoryAxis
        dependentAxis
        tickFormat={(t: number) => `${t}%`}
        style={{ tickLabels: { fill: colors.textMuted, fontSize: 11 }, grid: { stroke: colors.border, strokeDasharray: '2,4' }, axis: { stroke: colors.border } }}
      />
      <VictoryBar
        data={data}
        style={{ data: { fill: colors.primary } }}
        barWidth={Math.min(36, (width - 80) / Math.max(1, data.length) - 6)}
        labels={({ datum }: { datum: { y: number } }) => `${datum.y}%`}
      />
    </VictoryChart>
  );
}
