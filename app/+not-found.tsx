import { Link } from 'expo-router';
import { StyleSheet, View } from 'react-native';
import { Text } from '@/components/ui/text';
import { useTheme } from '@/components/theme/theme-provider';

export default function NotFound() {
  const theme = useTheme();
  return (
    <View style={[styles.page, { backgroundColor: theme.colors.background }]}>
      <Text variant="heading">This page is not here</Text>
      <Text tone="muted">The link may be old, or the page may have moved.</Text>
      <Link href="/" style={{ color: theme.colors.primary, ...theme.type.label, padding: 12 }}>
        Go to your home screen
      </Link>
    </View>
  );
}

const styles = StyleSheet.create({
  page: { flex: 1, alignItems: 'center', justifyContent: 'center', gap: 12, padding: 24 },
});
