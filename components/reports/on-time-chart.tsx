import { useState } from 'react';
import { View, type LayoutChangeEvent } from 'react-native';
import type { OnTimeRow } from '@/shared/reports';
import { DeferredChart, LazyOnTimePlot } from '@/components/bedside/lazy-chart';
import { Text } from '@/components/ui/text';

const PLOT_HEIGHT = 220;

/**
 * On-time rate (%) as bars; the numbers are in the table below, so the chart is decorative to
 * screen readers. The drawing (victory) loads lazily, in the same chunk as the flowsheet's trend.
 */
export function OnTimeChart({ title, rows }: { title: string; rows: (OnTimeRow & { label: string })[] }) {
  const [width, setWidth] = useState(340);
  const data = rows.map((r) => ({ x: r.label, y: r.rate === null ? 0 : Math.round(r.rate * 1000) / 10 }));
  return (
    <View
      onLayout={(e: LayoutChangeEvent) => setWidth(Math.max(280, e.nativeEvent.layout.width))}
      accessibilityElementsHidden
      importantForAccessibility="no-hide-descendants"
      aria-hidden
    >
      <Text variant="label">{title}</Text>
      {data.length === 0 ? (
        <Text tone="muted">No remote-site checks in this range.</Text>
      ) : (
        <DeferredChart height={PLOT_HEIGHT} unavailable="The chart could not be loaded; the figures are in the table below.">
          <LazyOnTimePlot data={data} width={width} height={PLOT_HEIGHT} />
        </DeferredChart>
      )}
    </View>
  );
}
