import type { CheckClocks, NextCheck } from '@/shared/types/bedside';
import { StatusBadge } from '@/components/ui/status-badge';
import { duration } from './format';

/** A check clock as a live countdown: word, icon and colour together. `what` names the clock. */
export function CheckBadge({ next, now, what = 'Check' }: { next: NextCheck; now: Date; what?: string }) {
  if (next.status === 'never' || !next.dueAt) return <StatusBadge tone="neutral" icon="clock" label={`No ${what.toLowerCase()} yet`} />;
  const ms = Date.parse(next.dueAt) - now.getTime();
  if (ms < 0) return <StatusBadge tone="danger" icon="alert" label={`${what} overdue by ${duration(-ms)}`} />;
  if (next.status === 'due-soon' || ms <= 15 * 60_000) return <StatusBadge tone="warning" icon="clock" label={`${what} due soon: in ${duration(ms)}`} />;
  return <StatusBadge tone="ok" icon="check" label={`${what === 'Check' ? 'Next check' : what} in ${duration(ms)}`} />;
}

/** Every check clock of an infant: the remote-site check, manual mode's 15-minute check, each recheck. */
export function CheckClockBadges({ checks, next, now }: { checks?: CheckClocks; next: NextCheck; now: Date }) {
  if (!checks) return <CheckBadge next={next} now={now} />;
  return (
    <>
      <CheckBadge next={checks.remote} now={now} />
      {checks.manual ? <CheckBadge next={checks.manual} now={now} what="Manual-mode check" /> : null}
      {checks.rechecks.map((r) => (
        <CheckBadge key={r.flagId} next={r} now={now} what="Recheck" />
      ))}
    </>
  );
}
