import { useQuery } from '@tanstack/react-query';
import type { CaughtMail } from '@/shared/types/board';
import { api } from '@/components/api/client';
import { STALE } from '@/components/api/query-client';

export const MAILBOX_RQKEY_ROOT = 'mailbox';
export const DEMO_RQKEY_ROOT = 'demo-mode';

export const mailboxKeys = {
  mine: () => [MAILBOX_RQKEY_ROOT] as const,
  mode: () => [DEMO_RQKEY_ROOT] as const,
};

/** The signed-in person's own caught mail (the demo only; production answers 404). */
export function useMailboxQuery() {
  return useQuery({
    queryKey: mailboxKeys.mine(),
    queryFn: ({ signal }) => api<{ messages: CaughtMail[] }>('/mailbox', { signal }).then((r) => r.messages),
    staleTime: STALE.live,
    refetchInterval: 15_000,
  });
}

/** Whether this server is the demo (it has a mailbox), from the public health answer. */
export function useDemoModeQuery() {
  return useQuery({
    queryKey: mailboxKeys.mode(),
    queryFn: ({ signal }) => api<{ mode?: 'demo' | 'production' }>('/health', { signal }).then((r) => r.mode === 'demo'),
    staleTime: Infinity,
  });
}
