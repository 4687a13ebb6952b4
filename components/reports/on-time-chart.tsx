import { useState } from 'react';
import { View, type LayoutChangeEvent } from 'react-native';
import { VictoryAxis, VictoryBar, VictoryChart } from 'victory-native';
import type { OnTimeRow } from '@/shared/reports';
import { useTheme } from '../theme/theme-provider';
import { Text } from '../ui/text';

/** On-time rate (%) as bars; the numbers are in the table below, so the chart is decorative to screen readers. */
export function OnTimeChart({ title, rows }: { title: string; rows: Array<OnTimeRow & { label: string }> }) {
  const { colors } = useTheme();
  const [width, setWidth] = useState(340);
  const data = rows.map((r) => ({ x: r.label, y: r.rate === null ? 0 : Math.round(r.rate * 1000) / 10 }));
  return (
    <View onLayout={(e: LayoutChangeEvent) => setWidth(Math.max(280, e.nativeEvent.layout.width))} accessibilityElementsHidden importantForAccessibility="no-hide-descendants">
      <Text variant="label">{title}</Text>
      {data.length === 0 ? (
        <Text tone="muted">No remote-site checks in this range.</Text>
      ) : (
        <VictoryChart width={width} height={220} domain={{ y: [0, 100] }} domainPadding={{ x: 30 }} padding={{ top: 16, bottom: 40, left: 48, right: 16 }}>
          <VictoryAxis style={{ tickLabels: { fill: colors.textMuted, fontSize: 11 }, axis: { stroke: colors.border } }} />
          <VictoryAxis dependentAxis tickFormat={(t: number) => `${t}%`} style={{ tickLabels: { fill: colors.textMuted, fontSize: 11 }, grid: { stroke: colors.border, strokeDasharray: '2,4' }, axis: { stroke: colors.border } }} />
          <VictoryBar data={data} style={{ data: { fill: colors.primary } }} barWidth={Math.min(36, (width - 80) / Math.max(1, data.length) - 6)} labels={({ datum }: { datum: { y: number } }) => `${datum.y}%`} />
        </VictoryChart>
      )}
    </View>
  );
}
