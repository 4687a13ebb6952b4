import { StyleSheet, View } from 'react-native';
import { useTheme } from '../theme/theme-provider';
import { Text } from './text';

/**
 * Progress of long work (an upload, an export). `value` is 0–1, or null while the size is not
 * known yet. The words carry the state too: "Uploading roster… 40 %".
 */
export function ProgressBar({ label, value }: { label: string; value: number | null }) {
  const { colors } = useTheme();
  const pct = value === null ? null : Math.round(Math.min(1, Math.max(0, value)) * 100);
  return (
    <View style={styles.wrap}>
      <Text variant="label">
        {label}
        {pct === null ? '' : ` ${pct} %`}
      </Text>
      <View
        role="progressbar"
        aria-label={label}
        aria-valuemin={0}
        aria-valuemax={100}
        aria-valuenow={pct ?? undefined}
        style={[styles.track, { borderColor: colors.border, backgroundColor: colors.surfaceSunken }]}
      >
        <View style={[styles.fill, { backgroundColor: colors.primary, width: pct === null ? '30%' : `${pct}%` }]} />
      </View>
    </View>
  );
}

const styles = StyleSheet.create({
  wrap: { gap: 6 },
  track: { height: 12, borderRadius: 6, borderWidth: 1, overflow: 'hidden' },
  fill: { height: '100%' },
});
