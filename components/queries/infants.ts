import { useMutation, useQuery, useQueryClient, type QueryClient } from '@tanstack/react-query';
import type { CorrectReadingInput, CreateActionInput, StartSessionInput } from '@/shared/schemas/bedside';
import type { CreateReadingResult, CurrentPlacement, Flowsheet, FlagAction, InfantDetail, InfantSummary, ReadingVersion, SessionRecord } from '@/shared/types/bedside';
import type { PlacementChangeInput } from '@/shared/schemas/placement';
import { api, ApiFailure } from '@/components/api/client';
import { flowsheetPath, MY_INFANTS_PATH, unitInfantsPath } from '@/components/api/paths';
import { fromEarlyAnswer, STALE } from '@/components/api/query-client';
import { pendingReadings, sendReading, type PendingReading } from '@/components/bedside/pending-readings';

export const RQKEY_ROOT = 'infants';
export const REFRESH_MS = 30_000;

export const infantKeys = {
  all: () => [RQKEY_ROOT] as const,
  mine: () => [RQKEY_ROOT, 'mine'] as const,
  unit: (unitId: string | null) => [RQKEY_ROOT, 'unit', unitId ?? 'all'] as const,
  detail: (id: string) => [RQKEY_ROOT, 'detail', id] as const,
  flowsheet: (id: string, hours: number) => [RQKEY_ROOT, 'flowsheet', id, hours] as const,
  flowsheets: (id: string) => [RQKEY_ROOT, 'flowsheet', id] as const,
};

const enc = encodeURIComponent;

const infantsOf = (body: { infants: InfantSummary[] }) => body.infants;

export function useMyInfantsQuery() {
  return useQuery({
    queryKey: infantKeys.mine(),
    queryFn: ({ signal }) => api<{ infants: InfantSummary[] }>(MY_INFANTS_PATH, { signal }).then(infantsOf),
    ...fromEarlyAnswer(MY_INFANTS_PATH, infantsOf),
    staleTime: STALE.live,
    refetchInterval: REFRESH_MS,
  });
}

/** The whole unit's infants; `enabled: false` until the list is shown (a phone on ward Wi-Fi should not fetch and refresh it unseen). */
export function useUnitInfantsQuery(unitId: string | null = null, { enabled = true }: { enabled?: boolean } = {}) {
  return useQuery({
    enabled,
    queryKey: infantKeys.unit(unitId),
    queryFn: ({ signal }) => api<{ infants: InfantSummary[] }>(unitInfantsPath(unitId), { signal }).then(infantsOf),
    staleTime: STALE.live,
    refetchInterval: REFRESH_MS,
  });
}

const infantQuery = (id: string) => ({
  queryKey: infantKeys.detail(id),
  queryFn: ({ signal }: { signal: AbortSignal }) => api<InfantDetail>(`/infants/${enc(id)}`, { signal }),
  staleTime: STALE.live,
});

export function useInfantQuery(id: string) {
  return useQuery(infantQuery(id));
}

/**
 * Read the infant's record-form defaults ahead (from the flowsheet, after its first paint): the
 * form then opens at once, and the offline worker keeps the answer so it opens with no connection.
 */
export function prefetchInfant(queryClient: QueryClient, id: string): Promise<void> {
  return queryClient.prefetchQuery(infantQuery(id));
}

export function useFlowsheetQuery(id: string, hours: 12 | 24 | 72) {
  return useQuery({
    queryKey: infantKeys.flowsheet(id, hours),
    queryFn: ({ signal }) => api<Flowsheet>(flowsheetPath(id, hours), { signal }),
    ...fromEarlyAnswer(flowsheetPath(id, hours), (sheet: Flowsheet) => sheet),
    staleTime: STALE.live,
    refetchInterval: REFRESH_MS,
  });
}

/** A clinical write changes the lists, the infant and every window of its flowsheet. */
function invalidateInfant(queryClient: ReturnType<typeof useQueryClient>, infantId: string) {
  void queryClient.invalidateQueries({ queryKey: infantKeys.mine() });
  void queryClient.invalidateQueries({ queryKey: [RQKEY_ROOT, 'unit'] });
  void queryClient.invalidateQueries({ queryKey: infantKeys.detail(infantId) });
  void queryClient.invalidateQueries({ queryKey: infantKeys.flowsheets(infantId) });
}

export type SaveReadingOutcome = { saved: true; result: CreateReadingResult } | { saved: false; pending: PendingReading };

/**
 * Save a reading. It goes into the device's pending store first; if the server cannot be
 * reached it stays there, shown as "not yet saved", and is resent when the connection returns.
 * A refusal (bad input) comes back as an error for the form and leaves nothing pending.
 */
export function useCreateReadingMutation(infantId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    networkMode: 'always',
    mutationFn: async (body: PendingReading['body']): Promise<SaveReadingOutcome> => {
      const pending: PendingReading = { infantId, body, savedAt: new Date().toISOString() };
      pendingReadings.add(pending);
      try {
        const result = await sendReading(infantId, body);
        pendingReadings.remove(body.id);
        return { saved: true, result };
      } catch (err) {
        if (err instanceof ApiFailure && (err.problem.kind === 'cannot-connect' || err.problem.kind === 'server-error')) {
          return { saved: false, pending };
        }
        // An ended session: the form keeps the reading and sends it again once she has signed in.
        // Any other refusal stays pending with the server's reason, so it is never lost unseen.
        if (err instanceof ApiFailure && err.problem.kind === 'unauthorized') pendingReadings.remove(body.id);
        else pendingReadings.markRefused(body.id, err instanceof Error ? err.message : 'The server refused this reading.');
        throw err;
      }
    },
    onSettled: () => invalidateInfant(queryClient, infantId),
  });
}

export function useCorrectReadingMutation(infantId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ readingId, body }: { readingId: string; body: CorrectReadingInput }) =>
      api<{ reading: ReadingVersion }>(`/readings/${enc(readingId)}/corrections`, { method: 'POST', body }),
    onSuccess: () => invalidateInfant(queryClient, infantId),
  });
}

export function useFlagActionMutation(infantId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ flagId, body }: { flagId: string; body: CreateActionInput }) =>
      api<{ action: FlagAction; flag: { id: string; status: 'open' | 'closed'; recheckDueAt: string | null } }>(`/flags/${enc(flagId)}/actions`, {
        method: 'POST',
        body,
      }),
    onSuccess: () => invalidateInfant(queryClient, infantId),
  });
}

/** Undo a mistaken action (it stays on record, marked entered in error). */
export function useUndoActionMutation(infantId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ flagId, actionId }: { flagId: string; actionId: string }) =>
      api<{ undo: { id: string; actionId: string; flagId: string } }>(`/flags/${enc(flagId)}/actions/${enc(actionId)}/undo`, {
        method: 'POST',
        body: { id: globalThis.crypto.randomUUID() },
      }),
    onSuccess: () => {
      invalidateInfant(queryClient, infantId);
      void queryClient.invalidateQueries({ queryKey: ['flag-history'] });
    },
  });
}

/** A flag's lifecycle in words, fetched when its history is opened. */
export function useFlagHistory(flagId: string | null, enabled: boolean) {
  return useQuery({
    queryKey: ['flag-history', flagId],
    queryFn: () =>
      api<{ flagId: string; events: { id: string; event: string; at: string; by: { id: string; name: string } | null; text: string }[] }>(`/flags/${enc(flagId!)}/history`),
    enabled: enabled && flagId !== null,
  });
}

export function useStartSkinToSkinMutation(infantId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: StartSessionInput) => api<{ session: SessionRecord }>(`/infants/${enc(infantId)}/skin-to-skin`, { method: 'POST', body }),
    onSuccess: () => invalidateInfant(queryClient, infantId),
  });
}

export function useEndSkinToSkinMutation(infantId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (sessionId: string) => api<{ session: SessionRecord }>(`/skin-to-skin/${enc(sessionId)}/end`, { method: 'POST', body: {} }),
    onSuccess: () => invalidateInfant(queryClient, infantId),
  });
}

/** Chart a change of the probe's placement on its own (the probe moved, the infant turned). */
export function usePlacementChangeMutation(infantId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: PlacementChangeInput) => api<{ created: boolean; placement: CurrentPlacement | null }>(`/infants/${enc(infantId)}/placement`, { method: 'POST', body }),
    onSuccess: () => invalidateInfant(queryClient, infantId),
  });
}
