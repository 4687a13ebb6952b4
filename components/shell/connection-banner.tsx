import { onlineManager } from '@tanstack/react-query';
import { useEffect, useState, useSyncExternalStore } from 'react';
import { StyleSheet, View } from 'react-native';
import { useTheme } from '@/components/theme/theme-provider';
import { Icon } from '@/components/ui/icon';
import { Text } from '@/components/ui/text';

export function useOnline(): boolean {
  return useSyncExternalStore(
    (cb) => onlineManager.subscribe(cb),
    () => onlineManager.isOnline(),
    () => true,
  );
}

/** Hospital Wi-Fi drops for a second at a time; only a loss that lasts is worth a line. */
const SETTLE_MS = 2_000;

/**
 * One calm line while the connection is lost, cleared when it returns. It sits in a polite
 * live region that is always in the page, so a screen reader hears the change once, and a
 * flicker of the network shows nothing at all. Neutral colours: nothing is wrong with the infant.
 */
export function ConnectionBanner() {
  const online = useOnline();
  const [shown, setShown] = useState(false);
  const { colors } = useTheme();
  useEffect(() => {
    if (online) return;
    const timer = setTimeout(() => setShown(true), SETTLE_MS);
    return () => {
      clearTimeout(timer);
      setShown(false);
    };
  }, [online]);
  return (
    <View role="status" aria-live="polite">
      {shown ? (
        <View style={[styles.banner, { backgroundColor: colors.surfaceSunken, borderColor: colors.border }]}>
          <Icon name="cloud-off" color={colors.textMuted} />
          <Text variant="label" style={styles.text}>
            No connection. Readings you save stay on this device and are sent when it returns.
          </Text>
        </View>
      ) : null}
    </View>
  );
}

const styles = StyleSheet.create({
  banner: { flexDirection: 'row', alignItems: 'center', gap: 8, paddingHorizontal: 16, paddingVertical: 10, borderBottomWidth: 1 },
  text: { flexShrink: 1 },
});
