import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { StyleSheet, View } from 'react-native';
import type { AdminUnit, AuditEntry } from '@/shared/types/admin';
import { problemOf } from '@/components/api/client';
import { useUser } from '@/components/auth/auth-provider';
import { useAdminUsersQuery, useAuditPageQuery, type AuditFilters } from '@/components/queries/admin';
import { useTheme } from '@/components/theme/theme-provider';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { formatDayTime } from '@/components/ui/format-time';
import { LoadingState } from '@/components/ui/state-view';
import { Text } from '@/components/ui/text';
import { TextField } from '@/components/ui/text-field';

interface FilterForm {
  person: string;
  from: string;
  to: string;
}

const DAY = /^\d{4}-\d{2}-\d{2}$/;

/** A date typed as YYYY-MM-DD, taken as a whole UTC day; '' for none, null when not a date. */
export function dayBound(text: string, end: boolean): string | null | '' {
  const t = text.trim();
  if (!t) return '';
  if (!DAY.test(t) || Number.isNaN(Date.parse(`${t}T00:00:00Z`))) return null;
  return end ? `${t}T23:59:59.999Z` : `${t}T00:00:00.000Z`;
}

/** Plain words for a value in an event's before or after. */
function show(value: unknown): string {
  if (value === null || value === undefined) return '—';
  // A list reads as words separated by commas, so it wraps on a phone.
  if (Array.isArray(value)) return value.length ? value.map(show).join(', ') : '(none)';
  if (typeof value === 'object') return JSON.stringify(value, null, 1).replace(/\s*\n\s*/g, ' ');
  return String(value);
}

/**
 * Who changed what in the administrator's units, newest first: filter by the person who acted
 * and by a range of days, and page back to older events.
 */
export function AuditLogCard({ units }: { units: AdminUnit[] }) {
  const me = useUser();
  // Everyone the administrator sees, whatever the people list is searching for.
  const people = useAdminUsersQuery().data ?? [];
  const [filters, setFilters] = useState<AuditFilters>({});
  const [cursors, setCursors] = useState<number[]>([]);
  const [fieldErrors, setFieldErrors] = useState<Partial<Record<keyof FilterForm, string>>>({});
  const { control, handleSubmit } = useForm<FilterForm>({ defaultValues: { person: '', from: '', to: '' } });
  const cursor = cursors.length ? cursors[cursors.length - 1]! : null;
  const page = useAuditPageQuery(filters, cursor);
  const zoneOf = (unitId: string | null) => units.find((u) => u.id === unitId)?.timeZone ?? units[0]?.timeZone ?? 'UTC';

  const apply = handleSubmit((v) => {
    const errors: Partial<Record<keyof FilterForm, string>> = {};
    const needle = v.person.trim().toLowerCase();
    const person = needle ? people.find((p) => p.name.toLowerCase().includes(needle) || p.email.toLowerCase().includes(needle)) : undefined;
    if (needle && !person) errors.person = `No one in your units matches "${v.person.trim()}".`;
    const from = dayBound(v.from, false);
    const to = dayBound(v.to, true);
    if (from === null) errors.from = 'Use a date as YYYY-MM-DD.';
    if (to === null) errors.to = 'Use a date as YYYY-MM-DD.';
    if (from && to && from > to) errors.to = 'The end of the range is before its start.';
    setFieldErrors(errors);
    if (Object.keys(errors).length) return;
    setCursors([]);
    setFilters({ actorId: person?.id, from: from || undefined, to: to || undefined });
  });

  return (
    <Card>
      <Text variant="title" role="heading" aria-level={2}>
        Audit log
      </Text>
      <Text tone="muted">
        Every change in your units: who made it, when, and the values before and after. Passwords and link tokens are never shown. Dates are whole days in UTC.
      </Text>
      <View style={styles.filters}>
        <View style={styles.cell}>
          <TextField control={control} name="person" label="Changed by" hint="Part of a name or e-mail; empty for anyone" autoCapitalize="none" serverError={fieldErrors.person} />
        </View>
        <View style={styles.cell}>
          <TextField control={control} name="from" label="From (YYYY-MM-DD)" autoCapitalize="none" serverError={fieldErrors.from} />
        </View>
        <View style={styles.cell}>
          <TextField control={control} name="to" label="To (YYYY-MM-DD)" autoCapitalize="none" serverError={fieldErrors.to} />
        </View>
      </View>
      <Button compact label="Show events" variant="secondary" onPress={() => void apply()} />
      {page.error ? (
        <Text tone="danger" role="alert">
          {problemOf(page.error).message}
        </Text>
      ) : !page.data ? (
        <LoadingState />
      ) : page.data.events.length === 0 ? (
        <Text tone="muted" role="status">
          No events match.
        </Text>
      ) : (
        <View role="list" aria-label="Audit events" style={styles.list}>
          {page.data.events.map((e) => (
            <AuditRow key={e.id} entry={e} when={formatDayTime(e.at, zoneOf(e.unitId), me.clock)} />
          ))}
        </View>
      )}
      <View style={styles.pager}>
        <Button compact variant="quiet" label="Newer" disabled={cursors.length === 0} onPress={() => setCursors((c) => c.slice(0, -1))} />
        <Button
          compact
          variant="quiet"
          label="Older"
          disabled={!page.data?.nextCursor}
          onPress={() => page.data?.nextCursor && setCursors((c) => [...c, page.data!.nextCursor!])}
        />
      </View>
    </Card>
  );
}

function AuditRow({ entry, when }: { entry: AuditEntry; when: string }) {
  const theme = useTheme();
  const before = entry.before && typeof entry.before === 'object' ? (entry.before as Record<string, unknown>) : {};
  const after = entry.after && typeof entry.after === 'object' ? (entry.after as Record<string, unknown>) : {};
  const keys = [...new Set([...Object.keys(before), ...Object.keys(after)])];
  return (
    <View role="listitem" aria-label={`${entry.action} by ${entry.actorName ?? 'the system'}, ${when}`} style={[styles.row, { borderColor: theme.colors.border }]}>
      <Text variant="bodyStrong">
        {entry.actorName ?? 'The system'} · {entry.action.replace(/-/g, ' ')}
      </Text>
      <Text tone="muted" variant="caption">
        {when}
        {entry.unitName ? ` · ${entry.unitName}` : ''} · {entry.entityType} {entry.entityId ?? ''}
      </Text>
      {keys.length ? (
        <View>
          {keys.map((k) => (
            <Text key={k} variant="caption" style={styles.change}>
              {k}: {k in before ? `${show(before[k])} → ` : ''}
              {show(after[k])}
            </Text>
          ))}
        </View>
      ) : null}
    </View>
  );
}

const styles = StyleSheet.create({
  filters: { flexDirection: 'row', flexWrap: 'wrap', gap: 12 },
  cell: { flexGrow: 1, minWidth: 200 },
  list: { gap: 8 },
  row: { gap: 2, paddingVertical: 8, borderTopWidth: 1 },
  change: { flexShrink: 1 },
  pager: { flexDirection: 'row', gap: 8, justifyContent: 'space-between' },
});
