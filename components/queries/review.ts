import { keepPreviousData, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { ReviewQueueQuery } from '@/shared/schemas/review';
import type { MyReviewNote, ReviewItemDetail, ReviewNote, ReviewQueueResponse } from '@/shared/types/review';
import { api } from '@/components/api/client';

export const REVIEW_RQKEY_ROOT = 'review';
export const reviewKeys = {
  all: () => [REVIEW_RQKEY_ROOT] as const,
  queue: (filters: Partial<ReviewQueueQuery>) => [REVIEW_RQKEY_ROOT, 'queue', filters] as const,
  item: (flagId: string) => [REVIEW_RQKEY_ROOT, 'item', flagId] as const,
};
const QUEUE_STALE_MS = 30_000;

export function queryString(params: Record<string, string | undefined | null>): string {
  const entries = Object.entries(params).filter((e): e is [string, string] => typeof e[1] === 'string' && e[1] !== '');
  return entries.length ? `?${new URLSearchParams(entries).toString()}` : '';
}

export function useReviewQueueQuery(filters: Partial<ReviewQueueQuery>) {
  return useQuery({
    queryKey: reviewKeys.queue(filters),
    queryFn: ({ signal }) => api<ReviewQueueResponse>(`/review/queue${queryString(filters as Record<string, string | undefined>)}`, { signal }),
    staleTime: QUEUE_STALE_MS,
    placeholderData: keepPreviousData,
  });
}

export function useReviewItemQuery(flagId: string) {
  return useQuery({
    queryKey: reviewKeys.item(flagId),
    queryFn: ({ signal }) => api<ReviewItemDetail>(`/review/items/${encodeURIComponent(flagId)}`, { signal }),
  });
}

/** Invalidates the item and every queue (its reviewed status changed). */
export function useTeachingNoteMutation(flagId: string) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (note: string) => api<{ review: ReviewNote }>(`/review/items/${encodeURIComponent(flagId)}/notes`, { method: 'POST', body: { note } }),
    onSuccess: () => client.invalidateQueries({ queryKey: reviewKeys.all() }),
  });
}

/** Teaching notes written about flags this nurse was concerned in. */
export function useMyReviewNotesQuery({ enabled = true }: { enabled?: boolean } = {}) {
  return useQuery({
    enabled,
    queryKey: [REVIEW_RQKEY_ROOT, 'mine'] as const,
    queryFn: ({ signal }) => api<{ notes: MyReviewNote[] }>('/reviews/mine', { signal }),
    staleTime: 5 * 60_000,
  });
}

/** Amend, withdraw or acknowledge a note, or close an item with no teaching point: every review view is refreshed. */
export function useReviewActionMutation() {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (action: { path: string; body?: object }) => api<unknown>(action.path, { method: 'POST', body: action.body ?? {} }),
    onSuccess: () => client.invalidateQueries({ queryKey: reviewKeys.all() }),
  });
}

export const reviewPaths = {
  amend: (reviewId: string) => `/reviews/${encodeURIComponent(reviewId)}/amend`,
  withdraw: (reviewId: string) => `/reviews/${encodeURIComponent(reviewId)}/withdraw`,
  acknowledge: (reviewId: string) => `/reviews/${encodeURIComponent(reviewId)}/acknowledge`,
  noTeachingPoint: (flagId: string) => `/review/items/${encodeURIComponent(flagId)}/no-teaching-point`,
};
