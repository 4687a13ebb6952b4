import { StyleSheet, View } from 'react-native';
import { useTheme } from '@/components/theme/theme-provider';
import type { ThemeColors } from '@/components/theme/theme';
import { Icon, type IconName } from './icon';
import { Text } from './text';

export type StatusTone = 'danger' | 'warning' | 'ok' | 'heat' | 'together' | 'neutral';

const SOFT: Record<StatusTone, keyof ThemeColors> = {
  danger: 'dangerSoft',
  warning: 'warningSoft',
  ok: 'okSoft',
  heat: 'heatSoft',
  together: 'togetherSoft',
  neutral: 'surfaceSunken',
};
const STRONG: Record<StatusTone, keyof ThemeColors> = {
  danger: 'danger',
  warning: 'warning',
  ok: 'ok',
  heat: 'heat',
  together: 'together',
  neutral: 'textMuted',
};

/** A status always as icon + word + colour, never colour alone. */
export function StatusBadge({ tone, icon, label, large }: { tone: StatusTone; icon: IconName; label: string; large?: boolean }) {
  const { colors } = useTheme();
  const fg = colors[STRONG[tone]];
  return (
    <View style={[styles.badge, { backgroundColor: colors[SOFT[tone]], borderColor: fg }, large && styles.large]}>
      <Icon name={icon} color={fg} size={large ? 22 : 16} />
      <Text variant={large ? 'label' : 'caption'} style={{ color: fg }}>
        {label}
      </Text>
    </View>
  );
}

const styles = StyleSheet.create({
  badge: { flexDirection: 'row', alignItems: 'center', gap: 4, paddingHorizontal: 8, paddingVertical: 3, borderRadius: 999, borderWidth: 1.5, alignSelf: 'flex-start' },
  large: { paddingHorizontal: 12, paddingVertical: 6 },
});
