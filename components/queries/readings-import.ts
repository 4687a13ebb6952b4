import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ImportResult, UploadPreview } from '@/shared/types/admin';
import { api } from '@/components/api/client';

const enc = encodeURIComponent;

export function useReadingsPreviewMutation(unitId: string) {
  return useMutation({
    mutationFn: (form: FormData) => api<UploadPreview>(`/readings-import/preview?unitId=${enc(unitId)}`, { method: 'POST', body: form }),
  });
}

/** Imports a previewed file with the lines the charge nurse confirmed one by one; the charts change, so every query is stale. */
export function useReadingsImportMutation() {
  const client = useQueryClient();
  return useMutation({
    mutationFn: ({ uploadId, confirmedLines }: { uploadId: string; confirmedLines: number[] }) =>
      api<ImportResult>(`/readings-import/${enc(uploadId)}/import`, { method: 'POST', body: { confirmedLines } }),
    onSuccess: () => client.invalidateQueries(),
  });
}

export const readingsErrorsPath = (uploadId: string) => `/readings-import/${enc(uploadId)}/errors.csv`;
