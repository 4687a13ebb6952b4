import { useState, type ReactNode } from 'react';
import { useUser } from '@/components/auth/auth-provider';
import { useHandoverQuery, useMyHandoverQuery, useUnitHandoverQuery } from '@/components/queries/board';
import { ScopeChoice, type Scope } from '@/components/ui/scope-choice';
import { can } from '@/shared/roles';
import { Caution } from '@/components/ui/caution';
import { Screen } from '@/components/ui/screen';
import { EmptyState, ErrorState, LoadingState } from '@/components/ui/state-view';
import type { HandoverResponse } from '@/shared/types/board';
import { HandoverActions } from './handover-actions';
import { HandoverView } from './handover-view';
import { NoPrint } from './no-print';
import { PrintStyle } from './print-style';

/** The unit zone is not in the handover answer; the demo units share one, and the device's is the fallback. */

function HandoverBody({
  query,
  title,
  emptyMessage,
  choice = null,
}: {
  query: { data?: HandoverResponse; error: unknown; refetch: () => unknown; isRefetching: boolean };
  title: string;
  emptyMessage: string;
  /** Shown above the handover, and while it loads. */
  choice?: ReactNode;
}) {
  const user = useUser();
  if (query.error && !query.data) {
    return (
      <Screen title={title}>
        {choice}
        <ErrorState error={query.error} onRetry={() => void query.refetch()} />
      </Screen>
    );
  }
  if (!query.data) {
    return (
      <Screen title={title}>
        {choice}
        <LoadingState label="Gathering the handover…" />
      </Screen>
    );
  }
  const { infants } = query.data;
  return (
    <Screen title={title} subtitle="The last 12 hours" actions={<HandoverActions infantIds={infants.map((h) => h.infant.id)} />} refreshing={query.isRefetching} onRefresh={() => void query.refetch()}>
      <PrintStyle />
      {choice}
      {infants.length === 0 ? <EmptyState title="Nothing to hand over" message={emptyMessage} /> : null}
      {infants.map((h) => (
        <HandoverView key={h.infant.id} handover={h} tempUnit={user.tempUnit} timeZone={h.timeZone} clock={user.clock} />
      ))}
      <Caution />
    </Screen>
  );
}

export function InfantHandoverScreen({ infantId }: { infantId: string }) {
  const query = useHandoverQuery(infantId);
  const name = query.data?.infants[0]?.infant.displayName;
  return <HandoverBody query={query} title={name ? `Handover: ${name}` : 'Handover'} emptyMessage="This infant was not found." />;
}

export function MyHandoverScreen() {
  const user = useUser();
  const [scope, setScope] = useState<Scope>('mine');
  const mine = useMyHandoverQuery();
  // The charge nurse hands the whole unit over to the next charge nurse.
  const canHandOverUnit = can(user.role, 'unit:manage');
  const unit = useUnitHandoverQuery(canHandOverUnit && scope === 'unit' ? (user.unitIds[0] ?? null) : null);
  const choice = canHandOverUnit ? (
    <NoPrint>
      <ScopeChoice label="Hand over" value={scope} onChange={setScope} />
    </NoPrint>
  ) : null;
  return scope === 'unit' && canHandOverUnit ? (
    <HandoverBody query={unit} title="Unit handover" emptyMessage="No infants are admitted to the unit." choice={choice} />
  ) : (
    <HandoverBody query={mine} title="My handover" emptyMessage="No infants are assigned to you this shift." choice={choice} />
  );
}
