import type { useRouter } from 'expo-router';
import { loadSchemas } from '@/components/forms/lazy-resolver';
import { afterNextPaint } from '@/components/ui/after-next-paint';

/**
 * The Record tap: the form's checks start loading now, the tap's feedback is painted, then the
 * record screen opens (afterNextPaint: rendering it inside the tap is what INP would see).
 */
export function openRecordForm(router: ReturnType<typeof useRouter>, infantId: string): void {
  loadSchemas().catch(() => undefined);
  afterNextPaint(() => router.push(`/infants/${infantId}/record`));
}
