import { onlineManager } from '@tanstack/react-query';
import { useSyncExternalStore } from 'react';
import { StyleSheet, View } from 'react-native';
import { useTheme } from '../theme/theme-provider';
import { Icon } from '../ui/icon';
import { Text } from '../ui/text';

export function useOnline(): boolean {
  return useSyncExternalStore(
    (cb) => onlineManager.subscribe(cb),
    () => onlineManager.isOnline(),
    () => true,
  );
}

/** One calm line while the connection is lost; gone when it returns. */
export function ConnectionBanner() {
  const online = useOnline();
  const { colors } = useTheme();
  if (online) return null;
  return (
    <View style={[styles.banner, { backgroundColor: colors.warningSoft, borderColor: colors.warning }]} role="status" accessibilityLiveRegion="polite">
      <Icon name="cloud-off" color={colors.warning} />
      <Text variant="label" style={{ color: colors.warning }}>
        Offline. Readings you save are kept on this device and sent when the connection returns.
      </Text>
    </View>
  );
}

const styles = StyleSheet.create({
  banner: { flexDirection: 'row', alignItems: 'center', gap: 8, padding: 10, borderBottomWidth: 1.5 },
});
