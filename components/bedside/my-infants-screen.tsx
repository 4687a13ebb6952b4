import { useRouter } from 'expo-router';
import { useMemo, useState } from 'react';
import { Pressable, StyleSheet, useWindowDimensions, View } from 'react-native';
import { byUrgency } from '@/shared/infant-urgency';
import type { InfantSummary } from '@/shared/types/bedside';
import { useUser } from '@/components/auth/auth-provider';
import { useMyInfantsQuery, useUnitInfantsQuery } from '@/components/queries/infants';
import { useTheme } from '@/components/theme/theme-provider';
import { WIDE_BREAKPOINT } from '@/components/theme/theme';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { Screen } from '@/components/ui/screen';
import { ScopeChoice, type Scope } from '@/components/ui/scope-choice';
import { EmptyState, ErrorState, LoadingState } from '@/components/ui/state-view';
import { StatusBadge } from '@/components/ui/status-badge';
import { Text } from '@/components/ui/text';
import { escalationLine, flagLook } from '@/components/board/flag-look';
import { CheckClockBadges } from './check-badge';
import { clockTime, CONTROL_MODE_LABELS, gestation, HEAT_SOURCE_LABELS, SITE_LABELS, temp } from './format';
import { openRecordForm } from './open-record-form';
import { usePendingReadings } from './pending-readings';
import { TeachingNotesCard } from './teaching-notes-card';
import { useNow } from './use-now';

export function MyInfantsScreen() {
  const [tab, setTab] = useState<Scope>('mine');
  const mine = useMyInfantsQuery();
  const unit = useUnitInfantsQuery(null, { enabled: tab === 'unit' });
  const query = tab === 'mine' ? mine : unit;
  const wide = useWindowDimensions().width >= WIDE_BREAKPOINT;
  // Most urgent first, from the stored flags and clocks the server sent (shared/infant-urgency.ts).
  const infants = useMemo(() => (query.data ? byUrgency(query.data) : undefined), [query.data]);
  return (
    <Screen title="My infants" subtitle="This shift" refreshing={query.isRefetching} onRefresh={() => void query.refetch()}>
      <ScopeChoice label="Show" value={tab} onChange={setTab} />
      {query.isError && !query.data ? (
        <ErrorState error={query.error} onRetry={() => void query.refetch()} />
      ) : query.isPending ? (
        <LoadingState label="Loading infants…" />
      ) : !infants || infants.length === 0 ? (
        <EmptyState title={tab === 'mine' ? 'No infants assigned to you this shift' : 'No infants admitted'} message="Ask the charge nurse if this looks wrong." />
      ) : (
        <View style={[styles.list, wide && styles.listWide]} role="list">
          {infants.map((infant) => (
            <InfantRow key={infant.id} infant={infant} wide={wide} />
          ))}
        </View>
      )}
      <TeachingNotesCard timeZone={query.data?.[0]?.timeZone ?? 'Europe/London'} />
    </Screen>
  );
}

export function InfantRow({ infant, wide = false }: { infant: InfantSummary; wide?: boolean }) {
  const user = useUser();
  const theme = useTheme();
  const router = useRouter();
  const now = useNow();
  const pending = usePendingReadings(infant.id);
  const canChart = user.role === 'nurse' || user.role === 'charge';
  const t = (iso: string) => clockTime(iso, infant.timeZone, user.clock);
  const { probe, remote } = infant.latest;
  const who = `${infant.bedLabel ?? 'No bed'}, ${infant.displayName}`;
  return (
    <View role="listitem" style={wide ? styles.itemWide : undefined}>
      <Card
        style={[
          styles.row,
          {
            borderColor: (infant.attention?.needsAttention ?? infant.openFlags.length) ? theme.colors.danger : infant.openFlags.length ? theme.colors.warning : theme.colors.border,
          },
        ]}
      >
        <Pressable
          role="link"
          // An <a href> on the web: Enter, middle click and screen readers treat it as the link it is.
          {...({ href: `/infants/${infant.id}` } as object)}
          aria-label={`${who}: open flowsheet`}
          style={styles.link}
          onPress={(e) => {
            e.preventDefault?.();
            router.push(`/infants/${infant.id}`);
          }}
        >
          <View style={styles.head}>
            <Text variant="title">
              {infant.bedLabel ?? '—'} · {infant.displayName}
            </Text>
            <View style={styles.badges}>
              <CheckClockBadges checks={infant.checks} next={infant.nextCheck} now={now} />
            </View>
          </View>
          <Text tone="muted">
            GA {gestation(infant.gestationWeeks, infant.gestationDays)} · corrected {gestation(infant.correctedWeeks, infant.correctedDays)} · day {infant.ageDays} ·{' '}
            {infant.weightGrams} g
          </Text>
          <Text tone="muted">
            {HEAT_SOURCE_LABELS[infant.heatSource]}
            {infant.controlMode ? ` · ${CONTROL_MODE_LABELS[infant.controlMode]}` : ''}
            {infant.setCenti !== null ? ` · set ${temp(infant.setCenti, user.tempUnit)}` : ''}
          </Text>
          <Text>
            Probe {probe ? `${temp(probe.centi, user.tempUnit)} at ${t(probe.takenAt)}` : '—'} · Remote{' '}
            {remote ? `${temp(remote.centi, user.tempUnit)} ${remote.site ? SITE_LABELS[remote.site].toLowerCase() : ''} at ${t(remote.takenAt)}` : '—'}
          </Text>
          <View style={styles.badges}>
            {infant.openFlags.map((f) => {
              const look = flagLook(f);
              const told = escalationLine(f.escalation, infant.timeZone, user.clock);
              return <StatusBadge key={f.key} tone={look.tone} icon={look.icon} label={told ? `${look.label}. ${told}` : look.label} />;
            })}
            {infant.skinToSkin ? <StatusBadge tone="together" icon="hands" label="Skin-to-skin" /> : null}
            {pending.length ? <StatusBadge tone="warning" icon="cloud-off" label={`${pending.length} not yet saved`} /> : null}
          </View>
        </Pressable>
        {/* The routine check in one tap from the list: the record form opens with the probe field ready. */}
        {canChart ? (
          <Button
            label="Record check"
            icon="thermometer"
            variant="secondary"
            compact
            accessibilityLabel={`Record check for ${who}`}
            style={styles.record}
            onPress={() => openRecordForm(router, infant.id)}
          />
        ) : null}
      </Card>
    </View>
  );
}

const styles = StyleSheet.create({
  list: { gap: 12 },
  listWide: { flexDirection: 'row', flexWrap: 'wrap' },
  // Two columns on a wide screen; each row keeps a readable width.
  itemWide: { flexBasis: 400, flexGrow: 1, maxWidth: '49.4%' },
  row: { borderWidth: 2 },
  link: { gap: 8 },
  record: { alignSelf: 'flex-start' },
  head: { flexDirection: 'row', flexWrap: 'wrap', justifyContent: 'space-between', gap: 8, alignItems: 'center' },
  badges: { flexDirection: 'row', flexWrap: 'wrap', gap: 6 },
});
