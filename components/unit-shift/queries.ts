import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { BedWarming, StartWarmingInput } from '@/shared/schemas/warming';
import type { BulkAssignInput, HandoverPlan } from '@/shared/schemas/shift-work';
import { api } from '@/components/api/client';
import { STALE } from '@/components/api/query-client';
import { BOARD_REFRESH_MS } from '@/components/queries/board';

const enc = encodeURIComponent;

export const shiftKeys = {
  warmings: (unitId: string) => ['warmings', unitId] as const,
  plan: (infantId: string) => ['handover-plan', infantId] as const,
  unitPlans: (unitId: string) => ['handover-plan', 'unit', unitId] as const,
};

/** The unit's beds being warmed for an admission (shown on their empty tiles). */
export function useWarmingsQuery(unitId: string | null) {
  return useQuery({
    queryKey: shiftKeys.warmings(unitId ?? 'none'),
    queryFn: ({ signal }) => api<{ warmings: BedWarming[] }>(`/units/${enc(unitId!)}/warmings`, { signal }).then((b) => b.warmings),
    enabled: !!unitId,
    staleTime: STALE.live,
    refetchInterval: BOARD_REFRESH_MS,
  });
}

export function useStartWarmingMutation(unitId: string, bedId: string) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (input: StartWarmingInput) => api<{ warming: BedWarming }>(`/units/${enc(unitId)}/beds/${enc(bedId)}/warming`, { method: 'POST', body: input }),
    onSuccess: () => client.invalidateQueries({ queryKey: shiftKeys.warmings(unitId) }),
  });
}

export function useStopWarmingMutation(unitId: string, bedId: string) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: () => api<{ ended: true }>(`/units/${enc(unitId)}/beds/${enc(bedId)}/warming/end`, { method: 'POST', body: {} }),
    onSuccess: () => client.invalidateQueries({ queryKey: shiftKeys.warmings(unitId) }),
  });
}

/** The current shift's plans of the unit's infants (the charge nurse's printed handover). */
export function useUnitPlansQuery(unitId: string | null) {
  return useQuery({
    queryKey: shiftKeys.unitPlans(unitId ?? 'none'),
    queryFn: ({ signal }) => api<{ plans: HandoverPlan[] }>(`/units/${enc(unitId!)}/handover-plans`, { signal }).then((b) => b.plans),
    enabled: !!unitId,
    staleTime: STALE.normal,
  });
}

export function usePlanQuery(infantId: string) {
  return useQuery({
    queryKey: shiftKeys.plan(infantId),
    queryFn: ({ signal }) => api<{ plan: HandoverPlan | null }>(`/infants/${enc(infantId)}/handover-plan`, { signal }).then((b) => b.plan),
    staleTime: STALE.normal,
  });
}

export function useWritePlanMutation(infantId: string) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (plan: string) => api<{ plan: HandoverPlan }>(`/infants/${enc(infantId)}/handover-plan`, { method: 'POST', body: { plan } }),
    onSuccess: () => client.invalidateQueries({ queryKey: ['handover-plan'] }),
  });
}

export function useBulkAssignMutation(unitId: string) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (input: BulkAssignInput) => api<{ assignments: { id: string }[] }>(`/units/${enc(unitId)}/assignments/bulk`, { method: 'POST', body: input }),
    onSuccess: () =>
      Promise.all([client.invalidateQueries({ queryKey: ['board'] }), client.invalidateQueries({ queryKey: ['infants'] }), client.invalidateQueries({ queryKey: ['handover'] })]),
  });
}
