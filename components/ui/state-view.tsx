import { ActivityIndicator, StyleSheet, View } from 'react-native';
import { problemOf } from '@/components/api/client';
import { useTheme } from '@/components/theme/theme-provider';
import { Button } from './button';
import { useInScreen } from './screen';
import { Icon } from './icon';
import { Text } from './text';

/** Loading, error (with retry) and empty states, shared by every data screen. */
export function LoadingState({ label = 'Loading…' }: { label?: string }) {
  const { colors } = useTheme();
  return (
    <View style={styles.center} role="status">
      <ActivityIndicator color={colors.primary} size="large" aria-label={label} />
      <Text tone="muted">{label}</Text>
    </View>
  );
}

/**
 * Something could not load. Standing in for a whole screen, its title is the page's level-1
 * heading; under a Screen's own title it is a level-2 one.
 */
export function ErrorState({ error, onRetry, level }: { error: unknown; onRetry?: () => void; level?: 1 | 2 | 3 }) {
  const { colors } = useTheme();
  const inScreen = useInScreen();
  const problem = problemOf(error);
  return (
    <View style={styles.center} role="alert">
      <Icon name={problem.kind === 'cannot-connect' ? 'cloud-off' : 'alert'} color={colors.danger} size={32} />
      <Text variant="bodyStrong" role="heading" aria-level={level ?? (inScreen ? 2 : 1)}>
        {problem.kind === 'cannot-connect' ? 'No connection' : 'This could not be loaded'}
      </Text>
      <Text tone="muted" style={styles.message}>
        {problem.message}
      </Text>
      {onRetry ? <Button label="Try again" variant="secondary" onPress={onRetry} /> : null}
    </View>
  );
}

export function EmptyState({ title, message }: { title: string; message?: string }) {
  const { colors } = useTheme();
  return (
    <View style={styles.center}>
      <Icon name="check" color={colors.textMuted} size={32} />
      <Text variant="bodyStrong">{title}</Text>
      {message ? (
        <Text tone="muted" style={styles.message}>
          {message}
        </Text>
      ) : null}
    </View>
  );
}

const styles = StyleSheet.create({
  center: { alignItems: 'center', justifyContent: 'center', padding: 32, gap: 12 },
  message: { textAlign: 'center', maxWidth: 420 },
});
