import { Link } from 'expo-router';
import { StyleSheet, View } from 'react-native';
import { TOUCH_TARGET } from '@/components/theme/theme';
import { useTheme } from '@/components/theme/theme-provider';
import { Text } from '@/components/ui/text';

export default function NotFound() {
  const theme = useTheme();
  return (
    <View style={[styles.page, { backgroundColor: theme.colors.background }]} role="main">
      <Text variant="heading" role="heading" aria-level={1} style={styles.center}>
        This page is not here
      </Text>
      <Text tone="muted" style={styles.center}>
        The link may be old, or the page may have moved.
      </Text>
      <Link href="/" style={[styles.link, theme.type.label, { color: theme.colors.primary, borderColor: theme.colors.primary }]}>
        Go to your home screen
      </Link>
    </View>
  );
}

const styles = StyleSheet.create({
  page: { flex: 1, alignItems: 'center', justifyContent: 'center', gap: 12, padding: 24 },
  center: { textAlign: 'center' },
  link: { minHeight: TOUCH_TARGET, paddingHorizontal: 16, paddingVertical: 12, borderWidth: 2, borderRadius: 10, textDecorationLine: 'underline' },
});
