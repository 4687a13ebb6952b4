import { StyleSheet, View, type ViewProps } from 'react-native';
import { useTheme } from '@/components/theme/theme-provider';

export function Card({ style, ...rest }: ViewProps) {
  const theme = useTheme();
  return <View {...rest} style={[styles.card, { backgroundColor: theme.colors.surface, borderColor: theme.colors.border }, style]} />;
}

const styles = StyleSheet.create({
  card: { borderRadius: 14, borderWidth: 1, padding: 16, gap: 8 },
});
