import { useId, type ReactNode } from 'react';
import { Modal, ScrollView, StyleSheet, View } from 'react-native';
import { useTheme } from '@/components/theme/theme-provider';
import { Button } from './button';
import { Text } from './text';

/**
 * A dialog over the screen, in view wherever the page was scrolled: the board's Admit, Manage,
 * warm-a-bed and shift-change forms. On the web react-native-web's Modal moves focus into it when
 * it opens, keeps it there and gives it back to the control that opened it on close; Escape
 * (onRequestClose) and the Close button close it.
 */
export function Sheet({ title, open, onClose, children, wide = false }: { title: string; open: boolean; onClose: () => void; children: ReactNode; wide?: boolean }) {
  const theme = useTheme();
  const titleId = useId();
  return (
    <Modal visible={open} transparent animationType="none" onRequestClose={onClose}>
      <View style={styles.backdrop}>
        {open ? (
          <View
            role="dialog"
            aria-modal
            aria-labelledby={titleId}
            style={[styles.panel, wide && styles.wide, { backgroundColor: theme.colors.surface, borderColor: theme.colors.border }]}
          >
            <View style={styles.header}>
              <Text variant="title" role="heading" aria-level={2} nativeID={titleId} id={titleId} style={styles.title}>
                {title}
              </Text>
              <Button label="Close" variant="quiet" compact onPress={onClose} />
            </View>
            <ScrollView contentContainerStyle={styles.body}>{children}</ScrollView>
          </View>
        ) : null}
      </View>
    </Modal>
  );
}

const styles = StyleSheet.create({
  backdrop: { flex: 1, alignItems: 'center', justifyContent: 'center', padding: 12, backgroundColor: 'rgba(0, 0, 0, 0.45)' },
  panel: { maxWidth: 640, width: '100%', maxHeight: '94%', borderRadius: 14, borderWidth: 1, paddingTop: 12, overflow: 'hidden' },
  wide: { maxWidth: 920 },
  header: { flexDirection: 'row', alignItems: 'center', gap: 8, paddingHorizontal: 20, paddingBottom: 8 },
  title: { flex: 1 },
  body: { paddingHorizontal: 20, paddingBottom: 20, gap: 12 },
});
