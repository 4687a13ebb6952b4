import { Text as RNText, type TextProps } from 'react-native';
import { useTheme } from '../theme/theme-provider';
import type { Theme } from '../theme/theme';

type Variant = keyof Theme['type'];
type Tone = 'default' | 'muted' | 'primary' | 'danger' | 'warning' | 'ok' | 'heat' | 'together' | 'onPrimary';

export interface ThemedTextProps extends TextProps {
  variant?: Variant;
  tone?: Tone;
}

/** Text in Inter, in the theme's colours. Headings get the heading role for screen readers. */
export function Text({ variant = 'body', tone = 'default', style, ...rest }: ThemedTextProps) {
  const theme = useTheme();
  const color = tone === 'default' ? theme.colors.text : tone === 'muted' ? theme.colors.textMuted : theme.colors[tone];
  const heading = variant === 'heading' || variant === 'title';
  return <RNText accessibilityRole={heading ? 'header' : undefined} {...rest} style={[theme.type[variant], { color }, style]} />;
}
