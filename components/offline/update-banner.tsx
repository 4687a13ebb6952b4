import { StyleSheet, View } from 'react-native';
import { useTheme } from '@/components/theme/theme-provider';
import { Button } from '@/components/ui/button';
import { Text } from '@/components/ui/text';
import { useUpdateReady } from './service-worker';

/** One line when a new build of Warmfold is ready; it takes over only when the nurse reloads. */
export function UpdateBanner() {
  const update = useUpdateReady();
  const { colors } = useTheme();
  return (
    <View role="status" aria-live="polite">
      {update ? (
        <View style={[styles.banner, { backgroundColor: colors.surfaceSunken, borderColor: colors.border }]}>
          <Text variant="label" style={styles.text}>
            A new version of Warmfold is ready. Save what you are writing, then reload.
          </Text>
          <Button label="Reload" variant="secondary" compact onPress={update} />
        </View>
      ) : null}
    </View>
  );
}

const styles = StyleSheet.create({
  banner: { flexDirection: 'row', alignItems: 'center', gap: 12, paddingHorizontal: 16, paddingVertical: 8, borderBottomWidth: 1 },
  text: { flexShrink: 1 },
});
