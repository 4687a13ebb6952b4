import { useMemo, useState } from 'react';
import { Pressable, StyleSheet, View } from 'react-native';
import { problemOf } from '@/components/api/client';
import { useTheme } from '@/components/theme/theme-provider';
import { Button } from '@/components/ui/button';
import { Segmented } from '@/components/ui/segmented';
import { Text } from '@/components/ui/text';
import type { BoardResponse } from '@/shared/types/board';
import { useBulkAssignMutation } from './queries';

/**
 * Shift change in one step: choose a nurse, tap her beds, choose the next nurse, and so on; one
 * button then assigns every nurse's infants for the chosen shift (all or nothing on the server).
 */
export function BulkAssign({ board, onDone }: { board: BoardResponse; onDone: () => void }) {
  const { colors } = useTheme();
  const occupied = board.beds.filter((b) => b.infant !== null).sort((a, b) => a.label.localeCompare(b.label, undefined, { numeric: true }));
  const [shift, setShift] = useState<'next' | 'current'>('next');
  const [nurseId, setNurseId] = useState(board.nurses[0]?.id ?? '');
  const [chosen, setChosen] = useState<Record<string, string>>({});
  const bulk = useBulkAssignMutation(board.unit.id);
  const nameOf = useMemo(() => new Map(board.nurses.map((n) => [n.id, n.name])), [board.nurses]);
  const groups = useMemo(() => {
    const by = new Map<string, string[]>();
    for (const [infantId, nurse] of Object.entries(chosen)) by.set(nurse, [...(by.get(nurse) ?? []), infantId]);
    return [...by.entries()].map(([id, infantIds]) => ({ nurseId: id, infantIds }));
  }, [chosen]);
  const problem = bulk.error ? problemOf(bulk.error) : null;

  if (board.nurses.length === 0) return <Text>No nurse of this unit has accepted an invitation yet.</Text>;
  const toggle = (infantId: string) =>
    setChosen((c) => {
      const next = { ...c };
      if (next[infantId] === nurseId) delete next[infantId];
      else next[infantId] = nurseId;
      return next;
    });
  const labelOf = (infantId: string) => occupied.find((b) => b.infant?.id === infantId)?.label ?? '';
  return (
    <View style={styles.body}>
      <Segmented
        label="For"
        value={shift}
        onChange={setShift}
        options={[
          { value: 'next', label: 'Next shift' },
          { value: 'current', label: 'This shift' },
        ]}
      />
      <Segmented label="Nurse" value={nurseId} onChange={setNurseId} options={board.nurses.map((n) => ({ value: n.id, label: n.name }))} />
      <Text variant="label" tone="muted">
        Tap the beds for {nameOf.get(nurseId) ?? 'this nurse'}; tap again to take one back.
      </Text>
      <View style={styles.beds} role="group" aria-label={`Beds for ${nameOf.get(nurseId) ?? 'this nurse'}`}>
        {occupied.map((b) => {
          const infant = b.infant!;
          const owner = chosen[infant.id];
          const mine = owner === nurseId;
          return (
            <Pressable
              key={b.bedId}
              role="checkbox"
              aria-checked={mine}
              aria-label={`${b.label}, ${infant.displayName}${owner && !mine ? `, given to ${nameOf.get(owner)}` : ''}`}
              onPress={() => toggle(infant.id)}
              style={[styles.bed, { borderColor: mine ? colors.primary : colors.border, backgroundColor: mine ? colors.primarySoft : colors.surface }]}
            >
              <Text variant="bodyStrong">{b.label}</Text>
              <Text variant="caption" tone="muted" numberOfLines={1}>
                {owner ? nameOf.get(owner) : infant.displayName}
              </Text>
            </Pressable>
          );
        })}
      </View>
      {groups.length ? (
        <View role="list" aria-label="Assignments to make">
          {groups.map((g) => (
            <Text key={g.nurseId} role="listitem">
              {nameOf.get(g.nurseId)}:{' '}
              {g.infantIds
                .map(labelOf)
                .sort((a, b) => a.localeCompare(b, undefined, { numeric: true }))
                .join(', ')}
            </Text>
          ))}
        </View>
      ) : null}
      {problem ? (
        <Text tone="danger" role="alert">
          {problem.message}
        </Text>
      ) : null}
      <Button
        label={`Assign ${Object.keys(chosen).length} ${Object.keys(chosen).length === 1 ? 'infant' : 'infants'}`}
        icon="check"
        disabled={groups.length === 0}
        busy={bulk.isPending}
        onPress={() => bulk.mutate({ shift, assignments: groups }, { onSuccess: onDone })}
      />
    </View>
  );
}

const styles = StyleSheet.create({
  body: { gap: 12 },
  beds: { flexDirection: 'row', flexWrap: 'wrap', gap: 8 },
  bed: { minWidth: 96, minHeight: 48, borderWidth: 2, borderRadius: 10, paddingHorizontal: 10, paddingVertical: 6, justifyContent: 'center' },
});
