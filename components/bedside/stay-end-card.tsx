import type { Flowsheet } from '@/shared/types/bedside';
import { DISCHARGE_REASON_LABELS } from '@/shared/vocabulary';
import { Card } from '@/components/ui/card';
import { StatusBadge } from '@/components/ui/status-badge';
import { Text } from '@/components/ui/text';
import { dayTime } from './format';

/** The end of the stay on the flowsheet: when the infant left, why and where to. */
export function StayEndCard({ discharge, timeZone, clock }: { discharge: Flowsheet['discharge']; timeZone: string; clock: '24h' | '12h' }) {
  if (!discharge) return null;
  const why = discharge.reason ? DISCHARGE_REASON_LABELS[discharge.reason] : 'Discharged';
  return (
    <Card role="region" aria-label="Discharge">
      <StatusBadge tone="neutral" icon="out" label={`Discharged ${dayTime(discharge.at, timeZone, clock)}`} />
      <Text>
        {why}
        {discharge.destination ? `: ${discharge.destination}` : ''}
      </Text>
      <Text variant="caption" tone="muted">
        The chart is closed; flags open at discharge were closed with the discharge as the reason.
      </Text>
    </Card>
  );
}
