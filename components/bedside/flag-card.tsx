import { useRouter } from 'expo-router';
import { StyleSheet, View } from 'react-native';
import { problemOf } from '@/components/api/client';
import { useUser } from '@/components/auth/auth-provider';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { useFlagActionMutation, useFlagHistory, useUndoActionMutation } from '@/components/queries/infants';
import { useTheme } from '@/components/theme/theme-provider';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { StatusBadge, type StatusTone } from '@/components/ui/status-badge';
import type { IconName } from '@/components/ui/icon';
import { Text } from '@/components/ui/text';
import { TextField } from '@/components/ui/text-field';
import { ACTION_LABELS, FLAG_CLOSED_HOW_LABELS, type ActionKind } from '@/shared/vocabulary';
import { BAND_LABELS } from '@/shared/thermal/bands';
import type { FlagKind } from '@/shared/thermal/evaluate';
import { HEAT_STRESS_CHECKLIST, HEAT_STRESS_SIGN_LABELS, type HeatStressReason } from '@/shared/thermal/heat-stress';
import { CLINICAL_PROMPT_CAVEAT } from '@/shared/thermal/policy';
import type { Flowsheet, FlowsheetFlag } from '@/shared/types/bedside';
import { actionWords, clockTime, duration, FLAG_LABELS, temp, tempDelta } from './format';
import { openRecordForm } from './open-record-form';
import { ProbeMoveForm } from './probe-move-form';
import { escalationLines, flagLook } from '@/components/board/flag-look';

/** What a nurse can record against each kind of flag, in the order she would usually try them. */
export const FLAG_ACTIONS: Record<FlagKind, ActionKind[]> = {
  gap: ['checked-probe-contact', 'checked-cover', 'moved-probe', 'adjusted-set-temperature', 'changed-control-mode', 'other'],
  'heat-stress': ['adjusted-set-temperature', 'reduced-heater-output', 'checked-probe-contact', 'removed-coverings', 'informed-charge-nurse', 'informed-medical-team', 'other'],
  'cold-stress': ['checked-probe-contact', 'checked-cover', 'adjusted-set-temperature', 'informed-charge-nurse', 'informed-medical-team', 'other'],
  fever: ['checked-probe-contact', 'removed-coverings', 'informed-medical-team', 'informed-charge-nurse', 'other'],
  'manual-mode': ['changed-control-mode', 'reduced-heater-output', 'informed-charge-nurse', 'other'],
  'skin-to-skin-deviation': ['checked-probe-contact', 'informed-charge-nurse', 'other'],
  'overdue-check': ['other'],
};

export function flagTone(kind: FlagKind): { tone: StatusTone; icon: IconName } {
  if (kind === 'heat-stress') return { tone: 'heat', icon: 'flame' };
  if (kind === 'cold-stress') return { tone: 'warning', icon: 'snow' };
  if (kind === 'skin-to-skin-deviation') return { tone: 'together', icon: 'hands' };
  if (kind === 'overdue-check') return { tone: 'danger', icon: 'clock' };
  return { tone: 'danger', icon: 'alert' };
}

const HEAT_REASON_LABELS = { 'remote-above-normal': 'Remote-site temperature above the normal band', 'heart-rate-high': 'Heart rate above the normal range' } as const;

function heatReasonLabel(r: HeatStressReason): string {
  return r.kind === 'sign' ? HEAT_STRESS_SIGN_LABELS[r.sign] : HEAT_REASON_LABELS[r.kind];
}

/** An open flag: what raised it, what has been done, what can be done next, and its recheck clock. */
export function FlagCard({ flag, sheet, canChart, now }: { flag: FlowsheetFlag; sheet: Flowsheet; canChart: boolean; now: Date }) {
  const user = useUser();
  const router = useRouter();
  const { colors } = useTheme();
  const mutation = useFlagActionMutation(sheet.infant.id);
  const undo = useUndoActionMutation(sheet.infant.id);
  const tz = sheet.infant.timeZone;
  const unit = user.tempUnit;
  const kinds = FLAG_ACTIONS[flag.kind];
  const done = new Set(flag.actions.map((a) => a.kind));
  const [noting, setNoting] = useState(false);
  // Moving the probe asks where to first (probe-move-form.tsx).
  const [moving, setMoving] = useState(false);
  const recheckMs = flag.recheckDueAt ? Date.parse(flag.recheckDueAt) - now.getTime() : null;
  const { tone } = flagTone(flag.kind);
  const look = flagLook(flag);
  // Each escalation, oldest first: a flag that worsened after it escalated was escalated again.
  const told = escalationLines(flag.escalation, tz, user.clock);
  const openRecord = () => openRecordForm(router, sheet.infant.id);
  return (
    <Card
      style={[styles.card, { borderColor: colors[tone === 'together' ? 'together' : tone === 'heat' ? 'heat' : tone === 'warning' ? 'warning' : 'danger'] }]}
      role="region"
      aria-label={FLAG_LABELS[flag.kind]}
    >
      <StatusBadge tone={look.tone} icon={look.icon} label={look.label} large />
      {told.map((line, i) => (
        <Text key={i} variant="bodyStrong">
          {line}
        </Text>
      ))}
      {flag.kind === 'fever' ? <Text tone="danger">A newborn with a fever may have an infection: tell the medical team per unit policy; do not only cool the infant.</Text> : null}
      {flag.kind === 'cold-stress' && flag.severity !== 'caution' ? <Text tone="danger">Tell the medical team per unit policy.</Text> : null}
      <Text>
        Raised {clockTime(flag.raisedAt, tz, user.clock)} ({duration(now.getTime() - Date.parse(flag.raisedAt))} ago)
      </Text>
      <FlagDetail flag={flag} unit={unit} tz={tz} clock={user.clock} />
      {recheckMs !== null ? (
        <StatusBadge
          tone={recheckMs < 0 ? 'danger' : 'warning'}
          icon="clock"
          label={recheckMs < 0 ? `Recheck overdue by ${duration(-recheckMs)}` : `Recheck due in ${duration(recheckMs)}`}
        />
      ) : null}
      {flag.recheck?.countsFrom && Date.parse(flag.recheck.countsFrom) > now.getTime() ? (
        <Text variant="caption">A recheck counts from {clockTime(flag.recheck.countsFrom, tz, user.clock)}, once the reading has settled.</Text>
      ) : null}
      {flag.kind === 'heat-stress' ? (
        <View style={styles.list} role="list" aria-label="Heat-stress steps">
          <Text variant="label">Steps</Text>
          {HEAT_STRESS_CHECKLIST.map((step, i) => (
            <Text key={step} role="listitem" variant="caption">
              {i + 1}. {step}
            </Text>
          ))}
        </View>
      ) : null}
      {flag.actions.length ? (
        <View style={styles.list} role="list" aria-label="Done so far">
          <Text variant="label">Done so far</Text>
          {flag.actions.map((a) => (
            <View key={a.id} role="listitem" style={styles.actionRow}>
              <Text variant="caption">
                ✓ {actionWords(a)} · {a.recordedBy.name} at {clockTime(a.at, tz, user.clock)}
              </Text>
              {canChart && flag.id ? (
                <Button
                  compact
                  variant="quiet"
                  label="Undo"
                  busy={undo.isPending && undo.variables?.actionId === a.id}
                  onPress={() => undo.mutate({ flagId: a.flagId, actionId: a.id })}
                />
              ) : null}
            </View>
          ))}
        </View>
      ) : null}
      {canChart ? (
        <View style={styles.list}>
          {kinds.length && flag.id ? <Text variant="label">Record what you did</Text> : null}
          <View style={styles.buttons} role="group" aria-label="Actions">
            {flag.id
              ? kinds.map((kind) =>
                  kind === 'other' ? (
                    // Something else: its note says what, so it opens a note field first.
                    <Button key={kind} compact variant="secondary" label={ACTION_LABELS[kind]} aria-expanded={noting} onPress={() => setNoting(!noting)} />
                  ) : (
                    <Button
                      key={kind}
                      compact
                      variant={done.has(kind) ? 'quiet' : 'secondary'}
                      label={ACTION_LABELS[kind]}
                      icon={done.has(kind) ? 'check' : undefined}
                      busy={mutation.isPending && mutation.variables?.body.kind === kind}
                      onPress={() => (kind === 'moved-probe' ? setMoving(!moving) : mutation.mutate({ flagId: flag.id!, body: { id: globalThis.crypto.randomUUID(), kind } }))}
                    />
                  ),
                )
              : null}
            <Button compact label={flag.kind === 'overdue-check' ? 'Record the check' : 'Record recheck'} icon="thermometer" onPress={openRecord} />
          </View>
          {noting && flag.id ? <OtherActionForm flagId={flag.id} infantId={sheet.infant.id} onDone={() => setNoting(false)} /> : null}
          {moving && flag.id ? <ProbeMoveForm flagId={flag.id} infantId={sheet.infant.id} onDone={() => setMoving(false)} /> : null}
        </View>
      ) : null}
      {mutation.isError || undo.isError ? (
        <Text tone="danger" role="alert">
          {problemOf(mutation.error ?? undo.error).message}
        </Text>
      ) : null}
      {flag.id ? <FlagHistory flagId={flag.id} tz={tz} clock={user.clock} /> : null}
      <Text variant="caption" tone="muted">
        {CLINICAL_PROMPT_CAVEAT}
        {flag.kind === 'overdue-check' ? '' : ` Recheck ${sheet.policy.recheckMinutes} minutes after an action.`}
      </Text>
    </Card>
  );
}

/** "Something else": what was done, in a note the nurse must write before it is saved. */
function OtherActionForm({ flagId, infantId, onDone }: { flagId: string; infantId: string; onDone: () => void }) {
  const mutation = useFlagActionMutation(infantId);
  const [id] = useState(() => globalThis.crypto.randomUUID());
  const { control, handleSubmit, setError } = useForm<{ note: string }>({ defaultValues: { note: '' } });
  const problem = mutation.isError ? problemOf(mutation.error) : null;
  const save = handleSubmit(({ note }) => {
    if (!note.trim()) {
      setError('note', { message: 'Say what you did.' });
      return;
    }
    mutation.mutate({ flagId, body: { id, kind: 'other', note: note.trim() } }, { onSuccess: onDone });
  });
  return (
    <View style={styles.list} role="group" aria-label="Something else">
      <TextField
        control={control}
        name="note"
        label="What did you do?"
        autoFocus
        returnKeyType="done"
        onSubmitEditing={() => void save()}
        serverError={problem && 'fields' in problem ? problem.fields?.note : undefined}
      />
      <View style={styles.buttons}>
        <Button compact label="Save action" icon="check" busy={mutation.isPending} onPress={() => void save()} />
        <Button compact variant="quiet" label="Cancel" onPress={onDone} />
      </View>
      {problem && !('fields' in problem && problem.fields?.note) ? (
        <Text tone="danger" role="alert">
          {problem.message}
        </Text>
      ) : null}
    </View>
  );
}

/** The flag's history in words (raised, actions, escalations, closing, withdrawal, reopening), on request. */
export function FlagHistory({ flagId, tz, clock }: { flagId: string; tz: string; clock: '24h' | '12h' }) {
  const [open, setOpen] = useState(false);
  const history = useFlagHistory(flagId, open);
  return (
    <View style={styles.list}>
      <Button compact variant="quiet" icon="clock" label={open ? 'Hide history' : 'Show history'} aria-expanded={open} onPress={() => setOpen(!open)} />
      {open ? (
        history.isError ? (
          <Text tone="danger" role="alert">
            {problemOf(history.error).message}
          </Text>
        ) : !history.data ? (
          <Text variant="caption">Loading the history…</Text>
        ) : (
          <View role="list" aria-label="History" style={styles.list}>
            {history.data.events.map((e) => (
              <Text key={e.id} role="listitem" variant="caption">
                {clockTime(e.at, tz, clock)} · {e.text}
                {e.by ? ` · ${e.by.name}` : ''}
              </Text>
            ))}
          </View>
        )
      ) : null}
    </View>
  );
}

function FlagDetail({ flag, unit, tz, clock }: { flag: FlowsheetFlag; unit: 'C' | 'F'; tz: string; clock: '24h' | '12h' }) {
  const d = flag.detail as Record<string, unknown>;
  const n = (k: string) => (typeof d[k] === 'number' ? (d[k] as number) : null);
  if (flag.kind === 'gap' && n('gapCenti') !== null) {
    const worst = n('worstGapCenti');
    return (
      <Text variant="bodyStrong">
        Probe and remote site {tempDelta(n('gapCenti')!, unit)} apart (limit {tempDelta(n('limitCenti') ?? 50, unit)})
        {worst !== null && worst > n('gapCenti')! ? `; worst ${tempDelta(worst, unit)}` : ''}
      </Text>
    );
  }
  if (flag.kind === 'overdue-check') {
    const due = typeof d.dueAt === 'string' ? d.dueAt : null;
    return <Text variant="bodyStrong">The remote-site check was due{due ? ` at ${clockTime(due, tz, clock)}` : ''}. Take and record it now.</Text>;
  }
  if (flag.kind === 'heat-stress') {
    const reasons = Array.isArray(d.reasons) ? (d.reasons as HeatStressReason[]) : [];
    return (
      <View style={styles.list} role="list" aria-label="Signs seen">
        <Text variant="label">Signs seen</Text>
        {reasons.length ? (
          reasons.map((r) => (
            <Text key={heatReasonLabel(r)} role="listitem">
              • {heatReasonLabel(r)}
            </Text>
          ))
        ) : (
          <Text tone="muted">None recorded</Text>
        )}
      </View>
    );
  }
  if (flag.kind === 'cold-stress' && typeof d.band === 'string') {
    return (
      <Text variant="bodyStrong">
        {BAND_LABELS[d.band as keyof typeof BAND_LABELS] ?? d.band}; lowest remote site {temp(n('lowestCenti'), unit)}
      </Text>
    );
  }
  if (flag.kind === 'skin-to-skin-deviation' && n('deviationCenti') !== null) {
    return (
      <Text variant="bodyStrong">
        {tempDelta(n('deviationCenti')!, unit)} from the reference {temp(n('referenceCenti'), unit)} (limit {tempDelta(n('limitCenti') ?? 50, unit)})
      </Text>
    );
  }
  return null;
}

/**
 * Flags closed in the window, most recent first: shown near the top so a closed flag is seen to close.
 * A mistaken action on a closed flag can still be taken back; that opens the flag again, so it asks first.
 */
export function ClosedFlags({ sheet, canChart = false }: { sheet: Flowsheet; canChart?: boolean }) {
  const user = useUser();
  const tz = sheet.infant.timeZone;
  const undo = useUndoActionMutation(sheet.infant.id);
  const [asking, setAsking] = useState<string | null>(null);
  const undoable = (f: FlowsheetFlag) => canChart && f.status === 'closed' && Boolean(f.id) && f.actions.length > 0;
  const closed = sheet.flags.filter((f) => f.status !== 'open').sort((a, b) => Date.parse(b.closedAt ?? b.raisedAt) - Date.parse(a.closedAt ?? a.raisedAt));
  if (!closed.length) return null;
  return (
    <Card role="region" aria-label="Closed flags">
      <Text variant="title" role="heading" aria-level={2}>
        Closed flags
      </Text>
      {closed.map((f) => (
        <View key={f.key} style={styles.closed}>
          {f.status === 'withdrawn' ? (
            // Withdrawn: it should not have been raised (a late entry or correction showed it); never a late check.
            <Text variant="caption" style={styles.struck}>
              {FLAG_LABELS[f.kind]} withdrawn{f.closedAt ? ` ${clockTime(f.closedAt, tz, user.clock)}` : ''}:{' '}
              {f.withdrawn?.reason === 'late-entry-on-time' ? 'the check was charted late but taken on time' : 'a correction showed it should not have been raised'}
            </Text>
          ) : (
            <StatusBadge
              tone="ok"
              icon="check"
              label={`${FLAG_LABELS[f.kind]} closed${f.closedAt ? ` ${clockTime(f.closedAt, tz, user.clock)}` : ''}${f.how && FLAG_CLOSED_HOW_LABELS[f.how] ? ` ${FLAG_CLOSED_HOW_LABELS[f.how]}` : ''}`}
            />
          )}
          <Text variant="caption" tone="muted">
            Raised {clockTime(f.raisedAt, tz, user.clock)}
            {undoable(f) ? '' : ` · ${f.actions.map(actionWords).join(', ') || 'no actions recorded'}`}
          </Text>
          {undoable(f) ? (
            <View style={styles.list} role="list" aria-label="Actions on this closed flag">
              {f.actions.map((a) => (
                <View key={a.id} role="listitem" style={styles.actionRow}>
                  <Text variant="caption">
                    ✓ {actionWords(a)} · {a.recordedBy.name} at {clockTime(a.at, tz, user.clock)}
                  </Text>
                  {asking === a.id ? (
                    <>
                      <Text variant="caption" role="alert">
                        Undo this action? The flag opens again.
                      </Text>
                      <Button
                        compact
                        variant="danger"
                        label="Undo and reopen"
                        busy={undo.isPending && undo.variables?.actionId === a.id}
                        onPress={() => undo.mutate({ flagId: a.flagId, actionId: a.id }, { onSuccess: () => setAsking(null) })}
                      />
                      <Button compact variant="quiet" label="Keep it" onPress={() => setAsking(null)} />
                    </>
                  ) : (
                    <Button compact variant="quiet" label="Undo" onPress={() => setAsking(a.id)} />
                  )}
                </View>
              ))}
            </View>
          ) : null}
        </View>
      ))}
      {undo.isError ? (
        <Text tone="danger" role="alert">
          {problemOf(undo.error).message}
        </Text>
      ) : null}
    </Card>
  );
}

const styles = StyleSheet.create({
  card: { borderWidth: 2 },
  list: { gap: 4 },
  buttons: { flexDirection: 'row', flexWrap: 'wrap', gap: 8 },
  actionRow: { flexDirection: 'row', flexWrap: 'wrap', alignItems: 'center', gap: 8 },
  closed: { gap: 2 },
  struck: { textDecorationLine: 'line-through' },
});
