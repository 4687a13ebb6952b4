import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { AdmitInfantInput, AssignNurseInput, DischargeInfantInput, UpdateInfantInput } from '@/shared/schemas/unit';
import type { BoardResponse, HandoverResponse } from '@/shared/types/board';
import { api } from '@/components/api/client';
import { STALE } from '@/components/api/query-client';

export const BOARD_RQKEY_ROOT = 'board';
export const HANDOVER_RQKEY_ROOT = 'handover';
/** The board refetches on its own this often; countdowns tick locally in between. */
export const BOARD_REFRESH_MS = 20_000;

export const boardKeys = {
  unit: (unitId: string) => [BOARD_RQKEY_ROOT, unitId] as const,
  handover: (infantId: string) => [HANDOVER_RQKEY_ROOT, 'infant', infantId] as const,
  myHandover: () => [HANDOVER_RQKEY_ROOT, 'mine'] as const,
  unitHandover: (unitId: string) => [HANDOVER_RQKEY_ROOT, 'unit', unitId] as const,
};

const enc = encodeURIComponent;

export function useBoardQuery(unitId: string | null) {
  return useQuery({
    queryKey: boardKeys.unit(unitId ?? 'none'),
    queryFn: ({ signal }) => api<BoardResponse>(`/units/${enc(unitId!)}/board`, { signal }),
    enabled: !!unitId,
    staleTime: STALE.live,
    refetchInterval: BOARD_REFRESH_MS,
  });
}

/** Every unit change touches the board, the infant lists and the handovers. */
function useInvalidateUnit() {
  const client = useQueryClient();
  return () =>
    Promise.all([
      client.invalidateQueries({ queryKey: [BOARD_RQKEY_ROOT] }),
      client.invalidateQueries({ queryKey: ['infants'] }),
      client.invalidateQueries({ queryKey: [HANDOVER_RQKEY_ROOT] }),
    ]);
}

export function useAdmitInfantMutation(unitId: string) {
  const invalidate = useInvalidateUnit();
  return useMutation({
    mutationFn: (input: AdmitInfantInput) => api<{ infant: { id: string } }>(`/units/${enc(unitId)}/infants`, { method: 'POST', body: input }),
    onSuccess: invalidate,
  });
}

export function useAssignNurseMutation(unitId: string) {
  const invalidate = useInvalidateUnit();
  return useMutation({
    mutationFn: (input: AssignNurseInput) => api<{ assignment: { id: string } }>(`/units/${enc(unitId)}/assignments`, { method: 'POST', body: input }),
    onSuccess: invalidate,
  });
}

export function useMoveInfantMutation() {
  const invalidate = useInvalidateUnit();
  return useMutation({
    mutationFn: ({ infantId, bedId }: { infantId: string; bedId: string }) => api(`/infants/${enc(infantId)}/move`, { method: 'POST', body: { bedId } }),
    onSuccess: invalidate,
  });
}

export function useUpdateInfantMutation() {
  const invalidate = useInvalidateUnit();
  return useMutation({
    mutationFn: ({ infantId, ...input }: UpdateInfantInput & { infantId: string }) => api(`/infants/${enc(infantId)}`, { method: 'PATCH', body: input }),
    onSuccess: invalidate,
  });
}

export function useDischargeInfantMutation() {
  const invalidate = useInvalidateUnit();
  return useMutation({
    mutationFn: ({ infantId, ...input }: DischargeInfantInput & { infantId: string }) =>
      api<{ closedFlags: number; closed: { id: string; kind: string }[]; discharge: { at: string; reason: string; destination: string | null } }>(
        `/infants/${enc(infantId)}/discharge`,
        { method: 'POST', body: input },
      ),
    onSuccess: invalidate,
  });
}

export function useAcknowledgeEscalationMutation() {
  const client = useQueryClient();
  return useMutation({
    mutationFn: ({ escalationId, note }: { escalationId: string; note?: string }) =>
      api(`/escalations/${enc(escalationId)}/acknowledge`, { method: 'POST', body: note ? { note } : {} }),
    onSuccess: () => client.invalidateQueries({ queryKey: [BOARD_RQKEY_ROOT] }),
  });
}

export function useHandoverQuery(infantId: string) {
  return useQuery({
    queryKey: boardKeys.handover(infantId),
    queryFn: ({ signal }) => api<HandoverResponse>(`/infants/${enc(infantId)}/handover`, { signal }),
    staleTime: STALE.live,
  });
}

export function useMyHandoverQuery() {
  return useQuery({
    queryKey: boardKeys.myHandover(),
    queryFn: ({ signal }) => api<HandoverResponse>('/nurses/me/handover', { signal }),
    staleTime: STALE.live,
  });
}

/** The whole unit's handover (charge nurse); idle until `unitId` is known. */
export function useUnitHandoverQuery(unitId: string | null) {
  return useQuery({
    queryKey: boardKeys.unitHandover(unitId ?? ''),
    queryFn: ({ signal }) => api<HandoverResponse>(`/units/${enc(unitId!)}/handover`, { signal }),
    enabled: unitId !== null,
    staleTime: STALE.live,
  });
}
