import { useQuery } from '@tanstack/react-query';
import type { ReportTable, UnitReport } from '@/shared/reports';
import { api } from '@/components/api/client';
import { queryString } from './review';

export const REPORTS_RQKEY_ROOT = 'reports';
export const reportKeys = { unit: (unitId: string, from: string, to: string) => [REPORTS_RQKEY_ROOT, unitId, from, to] as const };

export function useReportQuery(unitId: string | null, from: string, to: string) {
  return useQuery({
    queryKey: reportKeys.unit(unitId ?? '', from, to),
    queryFn: ({ signal }) => api<{ report: UnitReport; tables: ReportTable[] }>(`/reports${queryString({ unitId, from, to })}`, { signal }),
    enabled: !!unitId,
    staleTime: 60_000,
  });
}

/** Any other report of a unit and range (trends, comparison, per nurse, admission measure): asked only with valid dates. */
export function useReportPartQuery<T>(path: string, params: Record<string, string | null | undefined>, enabled: boolean) {
  return useQuery({
    queryKey: [REPORTS_RQKEY_ROOT, path, params] as const,
    queryFn: ({ signal }) => api<T>(`${path}${queryString(params)}`, { signal }),
    enabled,
    staleTime: 60_000,
  });
}
