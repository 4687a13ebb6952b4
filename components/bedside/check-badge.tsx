import type { NextCheck } from '@/shared/types/bedside';
import { StatusBadge } from '@/components/ui/status-badge';
import { duration } from './format';

/** The next remote-site check as a live countdown: word, icon and colour together. */
export function CheckBadge({ next, now }: { next: NextCheck; now: Date }) {
  if (next.status === 'never' || !next.dueAt) return <StatusBadge tone="neutral" icon="clock" label="No check yet" />;
  const ms = Date.parse(next.dueAt) - now.getTime();
  if (ms < 0) return <StatusBadge tone="danger" icon="alert" label={`Check overdue by ${duration(-ms)}`} />;
  if (next.status === 'due-soon' || ms <= 15 * 60_000) return <StatusBadge tone="warning" icon="clock" label={`Check due soon: in ${duration(ms)}`} />;
  return <StatusBadge tone="ok" icon="check" label={`Next check in ${duration(ms)}`} />;
}
