import { useId, useState, useSyncExternalStore } from 'react';
import { Modal, ScrollView, StyleSheet, View } from 'react-native';
import { useAuth } from '@/components/auth/auth-provider';
import { unsavedWork, type UnsavedWork } from '@/components/offline/device-data';
import { useTheme } from '@/components/theme/theme-provider';
import { Button } from '@/components/ui/button';
import { Text } from '@/components/ui/text';

/**
 * Sign-out, asked for from the rail or Settings. With nothing unsaved on the device it signs out
 * at once; otherwise a dialog says how many drafts and unsent readings there are and for which
 * infants, and signing out then deletes them with every stored patient detail.
 */
let request: UnsavedWork | null = null;
const listeners = new Set<() => void>();
function setRequest(next: UnsavedWork | null) {
  request = next;
  listeners.forEach((l) => l());
}

export function useSignOut(): () => void {
  const { signOut } = useAuth();
  return () => {
    const work = unsavedWork();
    if (work.drafts.length === 0 && work.pending.length === 0) void signOut();
    else setRequest(work);
  };
}

const plural = (n: number, one: string, many: string) => `${n} ${n === 1 ? one : many}`;

/** The lines of the warning: what would be lost, by infant. */
export function unsavedLines(work: UnsavedWork): string[] {
  const byInfant = new Map<string, { label: string; drafts: number; pending: number; refused: number }>();
  const entry = (infantId: string, label: string | undefined) => {
    const found = byInfant.get(infantId) ?? { label: label ?? 'An infant', drafts: 0, pending: 0, refused: 0 };
    if (label) found.label = label;
    byInfant.set(infantId, found);
    return found;
  };
  for (const d of work.drafts) entry(d.infantId, d.label).drafts += 1;
  for (const p of work.pending) {
    const e = entry(p.infantId, p.label);
    if (p.refusal) e.refused += 1;
    else e.pending += 1;
  }
  return [...byInfant.values()].map((e) => {
    const parts = [
      e.drafts ? plural(e.drafts, 'unsaved draft', 'unsaved drafts') : null,
      e.pending ? plural(e.pending, 'reading not yet sent', 'readings not yet sent') : null,
      e.refused ? plural(e.refused, 'reading the server refused', 'readings the server refused') : null,
    ].filter(Boolean);
    return `${e.label}: ${parts.join(', ')}`;
  });
}

export function SignOutDialog() {
  const work = useSyncExternalStore(
    (cb) => {
      listeners.add(cb);
      return () => listeners.delete(cb);
    },
    () => request,
    () => null,
  );
  const { signOut } = useAuth();
  const theme = useTheme();
  const titleId = useId();
  const [busy, setBusy] = useState(false);
  const close = () => setRequest(null);
  const count = work ? work.drafts.length + work.pending.length : 0;

  const confirm = async () => {
    setBusy(true);
    try {
      await signOut();
    } finally {
      setBusy(false);
      setRequest(null);
    }
  };

  return (
    <Modal visible={work !== null} transparent animationType="none" onRequestClose={close}>
      <View style={styles.backdrop}>
        {work ? (
          <View role="dialog" aria-modal aria-labelledby={titleId} style={[styles.panel, { backgroundColor: theme.colors.surface, borderColor: theme.colors.border }]}>
            <ScrollView contentContainerStyle={styles.body}>
              <Text variant="title" role="heading" aria-level={2} nativeID={titleId} id={titleId}>
                {count === 1 ? 'A reading is not saved' : `${count} readings are not saved`}
              </Text>
              <Text>Signing out deletes them from this device, with every patient detail kept here. They will not be charted.</Text>
              {unsavedLines(work).map((line) => (
                <Text key={line} variant="bodyStrong">
                  • {line}
                </Text>
              ))}
              <View style={styles.buttons}>
                <Button label="Stay signed in" variant="secondary" onPress={close} disabled={busy} />
                <Button label="Sign out and delete them" variant="danger" busy={busy} onPress={() => void confirm()} />
              </View>
            </ScrollView>
          </View>
        ) : null}
      </View>
    </Modal>
  );
}

const styles = StyleSheet.create({
  backdrop: { flex: 1, alignItems: 'center', justifyContent: 'center', padding: 16, backgroundColor: 'rgba(0, 0, 0, 0.45)' },
  panel: { maxWidth: 480, width: '100%', maxHeight: '94%', borderRadius: 14, borderWidth: 1 },
  body: { padding: 20, gap: 12 },
  buttons: { flexDirection: 'row', gap: 8, justifyContent: 'flex-end', flexWrap: 'wrap' },
});
