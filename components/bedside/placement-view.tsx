import { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import type { CurrentPlacement } from '@/shared/types/bedside';
import { problemOf } from '@/components/api/client';
import { usePlacementChangeMutation } from '@/components/queries/infants';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { StatusBadge } from '@/components/ui/status-badge';
import { Text } from '@/components/ui/text';
import { clockTime } from './format';
import { PlacementChoices, PlacementPromptNote, type PlacementChoice } from './placement-fields';
import { placementDefaults, placementWords } from './placement-values';

/**
 * The infant's current placement as stored (probe site, cover, position) and its stored prompt,
 * at the top of the flowsheet. A nurse charts a change here (the probe moved to the back or
 * flank, the infant turned) without a reading; the prompt clears once the server has stored the
 * new placement.
 */
export function CurrentPlacementCard({
  infantId,
  placement,
  timeZone,
  clock,
  canChart,
}: {
  infantId: string;
  placement: CurrentPlacement | null | undefined;
  timeZone: string;
  clock: '24h' | '12h';
  canChart: boolean;
}) {
  const [editing, setEditing] = useState(false);
  const change = usePlacementChangeMutation(infantId);
  const current = placementDefaults(placement);
  const [choice, setChoice] = useState<PlacementChoice>({ probeSite: current.probeSite, probeCovered: current.probeCovered, position: current.position });
  const words = placementWords(placement);
  const save = (next: PlacementChoice) =>
    change.mutate(
      {
        id: globalThis.crypto.randomUUID(),
        probeSite: next.probeSite,
        probeCovered: next.probeCovered === null ? null : next.probeCovered === 'yes',
        position: next.position,
      },
      { onSuccess: () => setEditing(false) },
    );
  const open = () => {
    setChoice({ probeSite: current.probeSite, probeCovered: current.probeCovered, position: current.position });
    setEditing(true);
  };
  return (
    <Card role="region" aria-label="Probe placement">
      <View style={styles.head}>
        <Text variant="label">Probe placement</Text>
        {placement ? (
          <Text variant="caption" tone="muted">
            charted {clockTime(placement.chartedAt, timeZone, clock)}
          </Text>
        ) : null}
      </View>
      <Text>{words ?? 'Not charted yet: choose it on the next reading or here.'}</Text>
      <PlacementPromptNote code={placement?.prompt?.code} />
      {canChart && placement?.prompt?.code === 'probe-under-prone-infant' && !editing ? (
        <Button
          compact
          label="Moved the probe to the back or flank"
          icon="check"
          busy={change.isPending}
          onPress={() => save({ probeSite: 'back-or-flank', probeCovered: current.probeCovered, position: current.position })}
        />
      ) : null}
      {canChart && !editing ? <Button compact variant="secondary" label="Change placement" onPress={open} /> : null}
      {editing ? (
        <View style={styles.edit}>
          <PlacementChoices value={choice} onChange={setChoice} />
          <View style={styles.actions}>
            <Button
              compact
              label="Save placement"
              icon="check"
              busy={change.isPending}
              disabled={choice.probeSite === null && choice.probeCovered === null && choice.position === null}
              onPress={() => save(choice)}
            />
            <Button compact variant="quiet" label="Cancel" onPress={() => setEditing(false)} />
          </View>
        </View>
      ) : null}
      {change.isError ? (
        <Text tone="danger" role="alert">
          {problemOf(change.error).message}
        </Text>
      ) : null}
    </Card>
  );
}

/** One line for a tile or a list: the placement in short words, with the prompt as a badge. */
export function PlacementLine({ placement }: { placement: CurrentPlacement | null | undefined }) {
  const words = placementWords(placement);
  if (!words && !placement?.prompt) return null;
  return (
    <View style={styles.line}>
      {words ? <Text variant="caption">{words}</Text> : null}
      {placement?.prompt ? <StatusBadge tone="warning" icon="alert" label="Move the probe: it lies under the infant" /> : null}
    </View>
  );
}

const styles = StyleSheet.create({
  head: { flexDirection: 'row', flexWrap: 'wrap', gap: 8, alignItems: 'baseline', justifyContent: 'space-between' },
  edit: { gap: 10 },
  actions: { flexDirection: 'row', flexWrap: 'wrap', gap: 8 },
  line: { gap: 4 },
});
