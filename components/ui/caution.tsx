import { StyleSheet, View } from 'react-native';
import { useTheme } from '@/components/theme/theme-provider';
import { Text } from './text';

/** Shown beside every clinical prompt. */
export const CAUTION_TEXT = 'Warmfold supports your judgment. Follow unit policy, the device instructions and licensed practice; it never controls a device.';

export function Caution() {
  const { colors } = useTheme();
  return (
    <View style={[styles.box, { borderColor: colors.border }]}>
      <Text variant="caption" tone="muted">
        {CAUTION_TEXT}
      </Text>
    </View>
  );
}

const styles = StyleSheet.create({
  box: { borderLeftWidth: 3, paddingLeft: 10, paddingVertical: 4 },
});
