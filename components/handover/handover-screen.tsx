import { useUser } from '@/components/auth/auth-provider';
import { useHandoverQuery, useMyHandoverQuery } from '@/components/queries/board';
import { Caution } from '@/components/ui/caution';
import { Screen } from '@/components/ui/screen';
import { EmptyState, ErrorState, LoadingState } from '@/components/ui/state-view';
import type { HandoverResponse } from '@/shared/types/board';
import { HandoverActions } from './handover-actions';
import { HandoverView } from './handover-view';
import { PrintStyle } from './print-style';

/** The unit zone is not in the handover answer; the demo units share one, and the device's is the fallback. */

function HandoverBody({ query, title, emptyMessage }: { query: { data?: HandoverResponse; error: unknown; refetch: () => unknown; isRefetching: boolean }; title: string; emptyMessage: string }) {
  const user = useUser();
  if (query.error && !query.data) return <ErrorState error={query.error} onRetry={() => void query.refetch()} />;
  if (!query.data) return <LoadingState label="Gathering the handover…" />;
  const { infants } = query.data;
  return (
    <Screen title={title} subtitle="The last 12 hours" actions={<HandoverActions infantIds={infants.map((h) => h.infant.id)} />} refreshing={query.isRefetching} onRefresh={() => void query.refetch()}>
      <PrintStyle />
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
  const query = useMyHandoverQuery();
  return <HandoverBody query={query} title="My handover" emptyMessage="No infants are assigned to you this shift." />;
}
