import { useQueryClient } from '@tanstack/react-query';
import { useEffect } from 'react';
import { startPendingFlush } from '@/components/bedside/pending-readings';

/**
 * Sends the signed-in nurse's pending readings when the connection returns, whatever screen is
 * open (My infants, the board, settings), once at start and every 30 seconds while any wait.
 * Mounted once by the signed-in layout; the readings go only under the session of the nurse
 * who saved them (pending-readings.ts).
 */
export function PendingSender(): null {
  const queryClient = useQueryClient();
  useEffect(() => startPendingFlush(queryClient), [queryClient]);
  return null;
}
