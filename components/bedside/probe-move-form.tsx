import { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { problemOf } from '@/components/api/client';
import { useFlagActionMutation } from '@/components/queries/infants';
import { Button } from '@/components/ui/button';
import { Segmented } from '@/components/ui/segmented';
import { Text } from '@/components/ui/text';
import { PROBE_SITE_LABELS, PROBE_SITES, type ProbeSite } from '@/shared/vocabulary';

const SITE_OPTIONS = PROBE_SITES.map((value) => ({ value, label: PROBE_SITE_LABELS[value] }));

/**
 * "Moved the probe to another site" asks where to: the new site is saved with the action and
 * becomes the infant's current placement (back or flank when the infant lies prone: Iowa
 * Neonatology Handbook, "Servocontrol").
 */
export function ProbeMoveForm({ flagId, infantId, onDone }: { flagId: string; infantId: string; onDone: () => void }) {
  const mutation = useFlagActionMutation(infantId);
  const [id] = useState(() => globalThis.crypto.randomUUID());
  const [site, setSite] = useState<ProbeSite | null>(null);
  const [missing, setMissing] = useState(false);
  const problem = mutation.isError ? problemOf(mutation.error) : null;
  const save = () => {
    if (!site) {
      setMissing(true);
      return;
    }
    mutation.mutate({ flagId, body: { id, kind: 'moved-probe', probeSite: site } }, { onSuccess: onDone });
  };
  return (
    <View style={styles.group} role="group" aria-label="Where the probe was moved to">
      <Segmented
        label="Moved the probe to"
        value={site}
        options={SITE_OPTIONS}
        onChange={(s) => {
          setSite(s);
          setMissing(false);
        }}
      />
      {missing ? (
        <Text variant="caption" tone="danger" role="alert">
          Choose where the probe was moved to.
        </Text>
      ) : null}
      <View style={styles.buttons}>
        <Button compact label="Save action" icon="check" busy={mutation.isPending} onPress={save} />
        <Button compact variant="quiet" label="Cancel" onPress={onDone} />
      </View>
      {problem ? (
        <Text tone="danger" role="alert">
          {problem.message}
        </Text>
      ) : null}
    </View>
  );
}

const styles = StyleSheet.create({
  group: { gap: 8 },
  buttons: { flexDirection: 'row', flexWrap: 'wrap', gap: 8 },
});
