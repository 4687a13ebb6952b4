import { useId, useState } from 'react';
import { Modal, StyleSheet, View } from 'react-native';
import { problemOf } from '@/components/api/client';
import { useTheme } from '@/components/theme/theme-provider';
import { Button } from '@/components/ui/button';
import { Text } from '@/components/ui/text';

/** A change to a person that needs a second look before it is made. */
export interface PendingChange {
  /** The dialog's heading, naming the person: "Deactivate Kofi Mensah?" */
  title: string;
  /** What will change and what follows from it, one line each. */
  lines: string[];
  confirmLabel: string;
  danger?: boolean;
  run: () => Promise<unknown>;
}

/**
 * A modal dialog that names the person and the change and asks to confirm it. On the web,
 * react-native-web's Modal keeps focus inside (its focus trap moves it to the first button, Cancel,
 * when the dialog opens) and gives it back to the control that had it when the dialog closes;
 * Escape (onRequestClose) cancels. A failed change stays open with the reason.
 */
export function ConfirmDialog({ change, onClose }: { change: PendingChange | null; onClose: () => void }) {
  const theme = useTheme();
  const titleId = useId();
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const open = change !== null;
  // A dialog that opens again starts without the last one's error (set while rendering, not in an effect).
  const [wasOpen, setWasOpen] = useState(open);
  if (open !== wasOpen) {
    setWasOpen(open);
    if (open) setError(null);
  }

  const confirm = async () => {
    if (!change) return;
    setBusy(true);
    setError(null);
    try {
      await change.run();
      onClose();
    } catch (err) {
      setError(problemOf(err).message);
    } finally {
      setBusy(false);
    }
  };

  return (
    <Modal visible={open} transparent animationType="none" onRequestClose={onClose}>
      <View style={styles.backdrop}>
        {change ? (
          <View role="dialog" aria-modal aria-labelledby={titleId} style={[styles.panel, { backgroundColor: theme.colors.surface, borderColor: theme.colors.border }]}>
            <Text variant="title" role="heading" aria-level={2} nativeID={titleId} id={titleId}>
              {change.title}
            </Text>
            {change.lines.map((line) => (
              <Text key={line}>{line}</Text>
            ))}
            {error ? (
              <Text tone="danger" role="alert">
                {error}
              </Text>
            ) : null}
            <View style={styles.buttons}>
              <Button label="Cancel" variant="secondary" onPress={onClose} disabled={busy} />
              <Button label={change.confirmLabel} variant={change.danger ? 'danger' : 'primary'} busy={busy} onPress={() => void confirm()} />
            </View>
          </View>
        ) : null}
      </View>
    </Modal>
  );
}

const styles = StyleSheet.create({
  backdrop: { flex: 1, alignItems: 'center', justifyContent: 'center', padding: 16, backgroundColor: 'rgba(0, 0, 0, 0.45)' },
  panel: { maxWidth: 480, width: '100%', borderRadius: 14, borderWidth: 1, padding: 20, gap: 12 },
  buttons: { flexDirection: 'row', gap: 8, justifyContent: 'flex-end', flexWrap: 'wrap' },
});
