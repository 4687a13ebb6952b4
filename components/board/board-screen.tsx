import { useMemo, useState } from 'react';
import { useRouter } from 'expo-router';
import { StyleSheet, View, useWindowDimensions } from 'react-native';
import { problemOf } from '@/components/api/client';
import { useUser } from '@/components/auth/auth-provider';
import { useAcknowledgeEscalationMutation, useBoardQuery } from '@/components/queries/board';
import { WIDE_BREAKPOINT } from '@/components/theme/theme';
import { useNightScreen } from '@/components/theme/theme-provider';
import { Button } from '@/components/ui/button';
import { Caution } from '@/components/ui/caution';
import { Screen } from '@/components/ui/screen';
import { Segmented } from '@/components/ui/segmented';
import { EmptyState, ErrorState, LoadingState } from '@/components/ui/state-view';
import { Text } from '@/components/ui/text';
import { can } from '@/shared/roles';
import type { BoardBed, BoardResponse } from '@/shared/types/board';
import { BedManagePanel } from './bed-manage-panel';
import { BoardTile } from './board-tile';
import { clockTime } from './board-format';
import { useNow } from './use-now';

type StatusFilter = 'all' | 'attention' | 'due-soon' | 'empty';

const STATUS_OPTIONS: Array<{ value: StatusFilter; label: string }> = [
  { value: 'all', label: 'All beds' },
  { value: 'attention', label: 'Needs attention' },
  { value: 'due-soon', label: 'Due soon' },
  { value: 'empty', label: 'Empty' },
];

export function matchesFilters(bed: BoardBed, status: StatusFilter, nurseId: string): boolean {
  if (status === 'attention' && bed.tier !== 0) return false;
  if (status === 'due-soon' && bed.tier !== 1) return false;
  if (status === 'empty' && bed.infant !== null) return false;
  if (nurseId !== 'all' && bed.infant?.assignedNurse?.id !== nurseId) return false;
  return true;
}

/** The unit board; at night (by the unit's shift) it turns dark unless the user chose a theme. */
export function BoardScreen() {
  const user = useUser();
  const unitId = user.unitIds[0] ?? null;
  const query = useBoardQuery(unitId);
  // The whole screen, shell included, goes dark on a night shift: no bright bar across a dim room.
  useNightScreen(query.data?.shift.shift === 'night');
  return <BoardBody query={query} />;
}

function BoardBody({ query }: { query: ReturnType<typeof useBoardQuery> }) {
  const user = useUser();
  const { width } = useWindowDimensions();
  const wide = width >= WIDE_BREAKPOINT;
  const [status, setStatus] = useState<StatusFilter>('all');
  const [nurseId, setNurseId] = useState('all');
  const [managing, setManaging] = useState<string | null>(null);
  const acknowledge = useAcknowledgeEscalationMutation();
  const nowMs = useNow(query.data?.serverTime);
  const canManage = can(user.role, 'unit:manage');
  const router = useRouter();

  if (user.unitIds.length === 0) return <EmptyState title="No unit" message="You are not a member of any unit yet." />;
  if (query.error && !query.data) return <ErrorState error={query.error} onRetry={() => void query.refetch()} />;
  if (!query.data) return <LoadingState label="Loading the board…" />;
  const board: BoardResponse = query.data;

  const beds = board.beds.filter((b) => matchesFilters(b, status, nurseId));
  const managed = managing ? board.beds.find((b) => b.bedId === managing) : undefined;
  const attention = board.beds.filter((b) => b.tier === 0).length;
  const tileWidth = wide ? ('31%' as const) : ('100%' as const);

  return (
    <Screen
      wide
      title="Unit board"
      subtitle={`${board.unit.name} · ${board.shift.shift === 'day' ? 'Day' : 'Night'} shift · ${attention} ${attention === 1 ? 'bed needs' : 'beds need'} attention · updated ${clockTime(board.serverTime, board.unit.timeZone, user.clock)}`}
      refreshing={query.isRefetching}
      onRefresh={() => void query.refetch()}
      actions={canManage ? <Button label="Import readings" variant="secondary" icon="list" compact onPress={() => router.push('/readings-import')} /> : undefined}
    >
      <View style={[styles.filters, wide && styles.filtersWide]}>
        <Segmented label="Show" value={status} onChange={setStatus} options={STATUS_OPTIONS} />
        <Segmented label="Nurse" value={nurseId} onChange={setNurseId} options={[{ value: 'all', label: 'Everyone' }, ...board.nurses.map((n) => ({ value: n.id, label: n.name }))]} />
      </View>

      {acknowledge.error ? (
        <Text tone="danger" role="alert">
          {problemOf(acknowledge.error).message}
        </Text>
      ) : null}

      {managed ? <BedManagePanel key={managed.bedId} board={board} bed={managed} tempUnit={user.tempUnit} onClose={() => setManaging(null)} /> : null}

      {beds.length === 0 ? (
        <EmptyState title="No beds match" message="Change the filters to see more beds." />
      ) : (
        <View style={styles.grid} role="list" aria-label="Beds, most urgent first">
          {beds.map((bed) => (
            <BoardTile
              key={bed.bedId}
              bed={bed}
              nowMs={nowMs}
              tempUnit={user.tempUnit}
              timeZone={board.unit.timeZone}
              clock={user.clock}
              dueSoonMinutes={board.unit.dueSoonMinutes}
              canManage={canManage}
              acknowledging={acknowledge.isPending ? (acknowledge.variables?.escalationId ?? null) : null}
              onManage={(b) => setManaging(b.bedId)}
              onAcknowledge={(escalationId) => acknowledge.mutate({ escalationId })}
              width={tileWidth}
            />
          ))}
        </View>
      )}
      <Caution />
    </Screen>
  );
}

const styles = StyleSheet.create({
  filters: { gap: 12 },
  filtersWide: { flexDirection: 'row', flexWrap: 'wrap', gap: 24 },
  grid: { flexDirection: 'row', flexWrap: 'wrap', gap: 16 },
});
