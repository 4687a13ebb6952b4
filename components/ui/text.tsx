import { Text as RNText, type TextProps } from 'react-native';
import { useTheme } from '@/components/theme/theme-provider';
import type { Theme } from '@/components/theme/theme';

type Variant = keyof Theme['type'];
type Tone = 'default' | 'muted' | 'primary' | 'danger' | 'warning' | 'ok' | 'heat' | 'together' | 'onPrimary';

export interface ThemedTextProps extends TextProps {
  variant?: Variant;
  tone?: Tone;
}

/**
 * Text in Inter, in the theme's colours. The variant is only the look: a "title" is a
 * section heading (level 2 unless `aria-level` says otherwise), but big numbers in "heading"
 * or "display" type (a bed label, a temperature) are not headings unless `role="heading"` is given,
 * so a screen reader's heading list stays the page's outline.
 */
export function Text({ variant = 'body', tone = 'default', style, ...rest }: ThemedTextProps) {
  const theme = useTheme();
  const color = tone === 'default' ? theme.colors.text : tone === 'muted' ? theme.colors.textMuted : theme.colors[tone];
  const implied = variant === 'title' && rest.role === undefined && rest.accessibilityRole === undefined;
  return <RNText {...(implied ? { role: 'heading' as const, 'aria-level': 2 } : null)} {...rest} style={[theme.type[variant], { color }, style]} />;
}
