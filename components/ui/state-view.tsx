import { ActivityIndicator, StyleSheet, View } from 'react-native';
import { problemOf } from '../api/client';
import { useTheme } from '../theme/theme-provider';
import { Button } from './button';
import { Icon } from './icon';
import { Text } from './text';

/** Loading, error (with retry) and empty states, shared by every data screen. */
export function LoadingState({ label = 'Loading…' }: { label?: string }) {
  const { colors } = useTheme();
  return (
    <View style={styles.center} accessibilityRole="progressbar" accessibilityLabel={label}>
      <ActivityIndicator color={colors.primary} size="large" />
      <Text tone="muted">{label}</Text>
    </View>
  );
}

export function ErrorState({ error, onRetry }: { error: unknown; onRetry?: () => void }) {
  const { colors } = useTheme();
  const problem = problemOf(error);
  return (
    <View style={styles.center} role="alert">
      <Icon name={problem.kind === 'cannot-connect' ? 'cloud-off' : 'alert'} color={colors.danger} size={32} />
      <Text variant="bodyStrong">{problem.kind === 'cannot-connect' ? 'No connection' : 'This could not be loaded'}</Text>
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
