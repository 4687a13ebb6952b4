import { useLayoutEffect, useRef, useState } from 'react';
import { useRouter } from 'expo-router';
import { Platform, StyleSheet, View, useWindowDimensions } from 'react-native';
import { problemOf } from '@/components/api/client';
import { useUser } from '@/components/auth/auth-provider';
import { useAcknowledgeEscalationMutation, useBoardQuery } from '@/components/queries/board';
import { WIDE_BREAKPOINT } from '@/components/theme/theme';
import { useNightScreen } from '@/components/theme/theme-provider';
import { Button } from '@/components/ui/button';
import { Caution } from '@/components/ui/caution';
import { Screen } from '@/components/ui/screen';
import { Segmented } from '@/components/ui/segmented';
import { Sheet } from '@/components/ui/sheet';
import { EmptyState, ErrorState, LoadingState } from '@/components/ui/state-view';
import { Text } from '@/components/ui/text';
import { BulkAssign } from '@/components/unit-shift/bulk-assign';
import { useWarmingsQuery } from '@/components/unit-shift/queries';
import { can } from '@/shared/roles';
import type { BoardBed, BoardResponse } from '@/shared/types/board';
import { BedManagePanel } from './bed-manage-panel';
import { BoardTile, type WallScale } from './board-tile';
import { clockTime } from './board-format';
import { useNow } from './use-now';

type StatusFilter = 'all' | 'attention' | 'due-soon' | 'empty';

const STATUS_OPTIONS: { value: StatusFilter; label: string }[] = [
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

const GAP = 12;

export interface WallGrid {
  columns: number;
  tileWidth: number;
  /** The height of an occupied bed's tile (every one the same). */
  tileHeight: number;
  scale: WallScale;
}

/**
 * The wall grid: as many columns as fit at the scale's narrowest tile, and occupied beds' tiles as
 * tall as the rows left below the grid's top allow, so the whole unit is on one screen. Empty beds
 * (last in the board's order) need less room: they follow at their own height (`emptyHeight`, the
 * tallest one as drawn), first in the cells the last row of occupied beds leaves free, so a unit
 * with empty beds gives its infants taller tiles. Every occupied tile has the same size, and every
 * empty one the same width (the last row's tiles do not stretch).
 */
export function wallGrid({ occupied, empty }: { occupied: number; empty: number }, width: number, height: number, windowWidth: number, emptyHeight: number): WallGrid {
  const scale: WallScale = windowWidth >= 1800 ? 'large' : 'medium';
  const minWidth = scale === 'large' ? 300 : 212;
  const count = occupied + empty;
  const columns = Math.max(1, Math.min(Math.max(count, 1), Math.floor((width + GAP) / (minWidth + GAP))));
  const tileWidth = Math.floor((width - GAP * (columns - 1)) / columns);
  const occupiedRows = Math.ceil(occupied / columns);
  const freeCells = occupied % columns === 0 ? 0 : columns - (occupied % columns);
  const emptyRows = Math.ceil(Math.max(0, empty - freeCells) / columns);
  const forOccupied = height - emptyRows * (emptyHeight + GAP);
  const rows = Math.max(1, occupiedRows);
  const tileHeight = Math.max(scale === 'large' ? 240 : 180, Math.floor((forOccupied - GAP * (rows - 1)) / rows));
  return { columns, tileWidth, tileHeight, scale };
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
  const { width, height } = useWindowDimensions();
  const wide = width >= WIDE_BREAKPOINT;
  const [status, setStatus] = useState<StatusFilter>('all');
  const [nurseId, setNurseId] = useState('all');
  const [filtersOpen, setFiltersOpen] = useState(false);
  const [managing, setManaging] = useState<string | null>(null);
  const [shiftChange, setShiftChange] = useState(false);
  const acknowledge = useAcknowledgeEscalationMutation();
  // The escalations being acknowledged: one, or every one a tile tells in the same words.
  const [acknowledging, setAcknowledging] = useState<string[]>([]);
  const acknowledgeAll = async (ids: string[]) => {
    setAcknowledging(ids);
    try {
      for (const escalationId of ids) await acknowledge.mutateAsync({ escalationId });
    } catch {
      // The mutation keeps the error; the line above the beds says it.
    } finally {
      setAcknowledging([]);
    }
  };
  const warmings = useWarmingsQuery(user.unitIds[0] ?? null);
  const nowMs = useNow(query.data?.serverTime);
  const canManage = can(user.role, 'unit:manage');
  const router = useRouter();
  const gridRef = useRef<View>(null);
  const [area, setArea] = useState<{ top: number; width: number; emptyHeight: number } | null>(null);

  // Where the grid starts, how wide it is and how tall its tallest empty bed is drawn (the web
  // only; a phone lists the beds in one column). Measured after every render, as anything above
  // the grid may move it; setArea keeps the old object when nothing moved, so React stops there.
  // eslint-disable-next-line react-hooks/exhaustive-deps
  useLayoutEffect(() => {
    if (Platform.OS !== 'web' || !wide || !gridRef.current) return;
    const el = gridRef.current as unknown as HTMLElement;
    const r = el.getBoundingClientRect();
    let emptyHeight = 0;
    for (const tile of Array.from(el.querySelectorAll<HTMLElement>('[data-empty-bed]'))) emptyHeight = Math.max(emptyHeight, Math.ceil(tile.getBoundingClientRect().height));
    const next = { top: Math.round(r.top + window.scrollY), width: Math.round(r.width), emptyHeight };
    setArea((a) => (a && a.top === next.top && a.width === next.width && a.emptyHeight === next.emptyHeight ? a : next));
  });

  if (user.unitIds.length === 0) return <EmptyState title="No unit" message="You are not a member of any unit yet." />;
  if (query.error && !query.data) return <ErrorState error={query.error} onRetry={() => void query.refetch()} />;
  if (!query.data) return <LoadingState label="Loading the board…" />;
  const board: BoardResponse = query.data;

  const beds = board.beds.filter((b) => matchesFilters(b, status, nurseId));
  const managed = managing ? board.beds.find((b) => b.bedId === managing) : undefined;
  const attention = board.beds.filter((b) => b.tier === 0).length;
  const warmingOf = new Map((warmings.data ?? []).map((w) => [w.bedId, w]));
  const occupied = beds.filter((b) => b.infant !== null).length;
  const grid = wide && area ? wallGrid({ occupied, empty: beds.length - occupied }, area.width, height - area.top - 8, width, area.emptyHeight) : null;
  const filtered = status !== 'all' || nurseId !== 'all';
  const filterSummary = `${STATUS_OPTIONS.find((o) => o.value === status)!.label} · ${nurseId === 'all' ? 'everyone' : (board.nurses.find((n) => n.id === nurseId)?.name ?? 'one nurse')}`;

  const filters = (
    <View style={styles.filterBox}>
      <Button
        // Unfiltered, one word: the board's heading row stays one line on a 1440-wide wall.
        label={filtered ? `Filters: ${filterSummary}` : 'Filters'}
        icon="list"
        variant={filtered ? 'primary' : 'quiet'}
        compact
        aria-expanded={filtersOpen}
        onPress={() => setFiltersOpen((o) => !o)}
      />
      {filtersOpen ? (
        <View style={[styles.filters, wide && styles.filtersWide]}>
          <Segmented label="Show" value={status} onChange={setStatus} options={STATUS_OPTIONS} />
          <Segmented
            label="Nurse"
            value={nurseId}
            onChange={setNurseId}
            options={[{ value: 'all', label: 'Everyone' }, ...board.nurses.map((n) => ({ value: n.id, label: n.name }))]}
          />
        </View>
      ) : null}
    </View>
  );

  return (
    <Screen
      wide
      title="Unit board"
      subtitle={`${board.unit.name} · ${board.shift.shift === 'day' ? 'Day' : 'Night'} shift · ${attention} ${attention === 1 ? 'bed needs' : 'beds need'} attention · updated ${clockTime(board.serverTime, board.unit.timeZone, user.clock)}`}
      refreshing={query.isRefetching}
      onRefresh={() => void query.refetch()}
      actions={
        canManage ? (
          <View style={styles.actions}>
            {wide ? filters : null}
            <Button label="Shift change" variant="secondary" icon="users" compact onPress={() => setShiftChange(true)} />
            <Button label="Import readings" variant="secondary" icon="list" compact onPress={() => router.push('/readings-import')} />
          </View>
        ) : wide ? (
          filters
        ) : undefined
      }
    >
      {acknowledge.error ? (
        <Text tone="danger" role="alert">
          {problemOf(acknowledge.error).message}
        </Text>
      ) : null}

      <Sheet title={managed ? `Bed ${managed.label}${managed.infant ? ` · ${managed.infant.displayName}` : ' · empty'}` : ''} open={!!managed} onClose={() => setManaging(null)}>
        {managed ? (
          <BedManagePanel key={managed.bedId} board={board} bed={managed} warming={warmingOf.get(managed.bedId)} tempUnit={user.tempUnit} onClose={() => setManaging(null)} />
        ) : null}
      </Sheet>
      <Sheet title="Shift change: each nurse's beds" open={shiftChange} onClose={() => setShiftChange(false)} wide>
        {shiftChange ? <BulkAssign board={board} onDone={() => setShiftChange(false)} /> : null}
      </Sheet>

      {beds.length === 0 ? (
        <EmptyState title="No beds match" message="Change the filters to see more beds." />
      ) : (
        <View ref={gridRef} style={styles.grid} role="list" aria-label="Beds, most urgent first">
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
              acknowledging={acknowledging}
              onManage={(b) => setManaging(b.bedId)}
              onAcknowledge={(ids) => void acknowledgeAll(ids)}
              warming={warmingOf.get(bed.bedId)}
              width={grid ? grid.tileWidth : '100%'}
              height={grid && bed.infant ? grid.tileHeight : undefined}
              scale={grid ? grid.scale : 'phone'}
            />
          ))}
        </View>
      )}
      {/* On a phone the beds come first; the filters follow them. */}
      {wide ? null : filters}
      <Caution />
    </Screen>
  );
}

const styles = StyleSheet.create({
  filterBox: { gap: 12 },
  filters: { gap: 12 },
  filtersWide: { flexDirection: 'row', flexWrap: 'wrap', gap: 24 },
  actions: { flexDirection: 'row', flexWrap: 'wrap', gap: 8, alignItems: 'flex-start' },
  grid: { flexDirection: 'row', flexWrap: 'wrap', gap: GAP, alignItems: 'flex-start' },
});
