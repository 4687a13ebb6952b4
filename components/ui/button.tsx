import { ActivityIndicator, Pressable, StyleSheet, View, type PressableProps } from 'react-native';
import { TOUCH_TARGET } from '@/components/theme/theme';
import { useTheme } from '@/components/theme/theme-provider';
import { Icon, type IconName } from './icon';
import { Text } from './text';

export interface ButtonProps extends Omit<PressableProps, 'children' | 'style'> {
  label: string;
  variant?: 'primary' | 'secondary' | 'danger' | 'quiet';
  icon?: IconName;
  busy?: boolean;
  compact?: boolean;
  style?: PressableProps['style'];
}

export function Button({ label, variant = 'primary', icon, busy, compact, disabled, style, ...rest }: ButtonProps) {
  const theme = useTheme();
  const c = theme.colors;
  const bg = variant === 'primary' ? c.primary : variant === 'danger' ? c.danger : variant === 'secondary' ? c.surface : 'transparent';
  const fg = variant === 'primary' || variant === 'danger' ? c.onPrimary : c.primary;
  const off = disabled || busy;
  return (
    <Pressable
      accessibilityRole="button"
      accessibilityLabel={label}
      accessibilityState={{ disabled: !!off, busy: !!busy }}
      disabled={off}
      {...rest}
      style={(state) => [
        styles.base,
        {
          backgroundColor: bg,
          borderColor: variant === 'secondary' ? c.primary : 'transparent',
          paddingHorizontal: compact ? theme.spacing.md : theme.spacing.xl,
          opacity: off ? 0.55 : state.pressed ? 0.85 : 1,
        },
        typeof style === 'function' ? style(state) : style,
      ]}
    >
      <View style={styles.row}>
        {busy ? <ActivityIndicator color={fg} size="small" aria-label="Working" /> : icon ? <Icon name={icon} color={fg} size={20} /> : null}
        <Text variant="label" style={{ color: fg }}>
          {label}
        </Text>
      </View>
    </Pressable>
  );
}

const styles = StyleSheet.create({
  base: { minHeight: TOUCH_TARGET, minWidth: TOUCH_TARGET, borderRadius: 10, borderWidth: 2, alignItems: 'center', justifyContent: 'center' },
  row: { flexDirection: 'row', alignItems: 'center', gap: 8 },
});
