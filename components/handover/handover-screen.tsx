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
import { Text } from '@/components/ui/text';
import { formatDayTime } from '@/components/ui/format-time';
import { HandoverPlanField } from '@/components/unit-shift/handover-plan';
import { PrintPage, PrintPageStyle } from '@/components/unit-shift/print-page';
import { useUnitPlansQuery } from '@/components/unit-shift/queries';
import { UnitSummary } from '@/components/unit-shift/unit-summary';
import { NoPrint } from './no-print';
import { PrintStyle, usePrintTime } from './print-style';

/** The unit zone is not in the handover answer; the demo units share one, and the device's is the fallback. */

function HandoverBody({
  query,
  title,
  emptyMessage,
  choice = null,
  summary = false,
}: {
  query: { data?: HandoverResponse; error: unknown; refetch: () => unknown; isRefetching: boolean };
  title: string;
  emptyMessage: string;
  /** Shown above the handover, and while it loads. */
  choice?: ReactNode;
  /** The unit handover starts with a one-page summary of every bed. */
  summary?: boolean;
}) {
  const user = useUser();
  const plans = useUnitPlansQuery(summary ? (user.unitIds[0] ?? null) : null);
  const printedAtMs = usePrintTime();
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
  const zone = infants[0]?.timeZone ?? Intl.DateTimeFormat().resolvedOptions().timeZone;
  // On every printed page: when and by whom it was printed.
  const printedAt = new Date(printedAtMs).toISOString();
  const printed = `printed at ${formatDayTime(printedAt, zone, user.clock).replace(/^(.*), (.*)$/, '$2 on $1')} by ${user.name}`;
  return (
    <Screen
      title={title}
      subtitle="The last 12 hours"
      actions={<HandoverActions infantIds={infants.map((h) => h.infant.id)} />}
      refreshing={query.isRefetching}
      onRefresh={() => void query.refetch()}
    >
      <PrintStyle />
      {choice}
      {infants.length === 0 ? <EmptyState title="Nothing to hand over" message={emptyMessage} /> : null}
      <PrintPageStyle />
      {summary && infants.length ? (
        <PrintPage first header={`Unit summary · ${infants.length} infants · ${printed}`}>
          <Text variant="heading" role="heading" aria-level={2}>
            Unit summary
          </Text>
          <UnitSummary handovers={infants} plans={plans.data ?? []} tempUnit={user.tempUnit} timeZone={zone} clock={user.clock} nowMs={Date.parse(query.data.generatedAt)} />
        </PrintPage>
      ) : null}
      {infants.map((h, i) => (
        <PrintPage key={h.infant.id} first={!summary && i === 0} header={`${h.infant.bedLabel ?? '—'} · ${h.infant.displayName} · ${printed}`}>
          <HandoverView handover={h} tempUnit={user.tempUnit} timeZone={h.timeZone} clock={user.clock} />
          <HandoverPlanField infantId={h.infant.id} canWrite={can(user.role, 'chart:write')} />
        </PrintPage>
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
  // The charge nurse hands the whole unit over to the next charge nurse: her handover opens on it.
  const canHandOverUnit = can(user.role, 'unit:manage');
  const [scope, setScope] = useState<Scope>(canHandOverUnit ? 'unit' : 'mine');
  const mine = useMyHandoverQuery();
  const unit = useUnitHandoverQuery(canHandOverUnit && scope === 'unit' ? (user.unitIds[0] ?? null) : null);
  const choice = canHandOverUnit ? (
    <NoPrint>
      <ScopeChoice label="Hand over" value={scope} onChange={setScope} />
    </NoPrint>
  ) : null;
  return scope === 'unit' && canHandOverUnit ? (
    <HandoverBody query={unit} title="Unit handover" emptyMessage="No infants are admitted to the unit." choice={choice} summary />
  ) : (
    <HandoverBody query={mine} title="My handover" emptyMessage="No infants are assigned to you this shift." choice={choice} />
  );
}
