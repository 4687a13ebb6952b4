import { useState } from 'react';
import { View, type LayoutChangeEvent } from 'react-native';
import { NORMAL_MAX_CENTI, NORMAL_MIN_CENTI } from '@/shared/thermal/bands';
import type { TempUnit } from '@/shared/thermal/units';
import type { Flowsheet } from '@/shared/types/bedside';
import { formatWhen } from '@/components/ui/format-time';
import { Text } from '@/components/ui/text';
import { FLAG_LABELS, temp } from './format';
import { DeferredChart, LazyTrendPlot } from './lazy-chart';

const PLOT_HEIGHT = 240;

/**
 * Probe, remote site and set temperature over the window, the normal band shaded, gap flags
 * marked. The drawing (victory) loads lazily when the card comes near the screen; the legend
 * and the latest figures are plain text and render at once, for screen readers and for a
 * nurse whose connection drops before the chart arrives.
 */
export function TrendChart({ sheet, unit, clock }: { sheet: Flowsheet; unit: TempUnit; clock: '24h' | '12h' }) {
  const [width, setWidth] = useState(340);
  const tz = sheet.infant.timeZone;
  const latest = sheet.readings[0];
  const openGaps = sheet.flags.filter((f) => f.kind === 'gap' && f.status === 'open').length;

  return (
    <View onLayout={(e: LayoutChangeEvent) => setWidth(Math.max(280, e.nativeEvent.layout.width))}>
      <View accessibilityElementsHidden importantForAccessibility="no-hide-descendants" aria-hidden>
        <DeferredChart height={PLOT_HEIGHT} unavailable="The chart could not be loaded; the latest figures are below and every reading is listed under Readings.">
          <LazyTrendPlot sheet={sheet} unit={unit} clock={clock} width={width} height={PLOT_HEIGHT} />
        </DeferredChart>
      </View>
      <Text variant="caption" tone="muted">
        Lines: probe (solid, round points), remote site (diamonds), set temperature (dashed); a dotted upright line marks midnight. Shaded: the normal band{' '}
        {temp(NORMAL_MIN_CENTI, unit)}–{temp(NORMAL_MAX_CENTI, unit)}. Red triangles: gap flags.
      </Text>
      <Text variant="caption" accessibilityLiveRegion="polite">
        {latest
          ? `Latest at ${formatWhen(latest.takenAt, tz, clock, Date.parse(sheet.to))}: probe ${temp(latest.probeCenti, unit)}, remote site ${temp(latest.remoteCenti, unit)}, set ${temp(latest.setCenti, unit)}. `
          : 'No readings in this window. '}
        {openGaps ? `${openGaps} open ${FLAG_LABELS.gap.toLowerCase()}${openGaps > 1 ? 's' : ''}.` : 'No open gap flag.'}
      </Text>
    </View>
  );
}
