import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { StyleSheet, View } from 'react-native';
import { ROLE_LABELS, ROLES, type Role } from '@/shared/roles';
import type { CreateUserInput, UpdateUserInput } from '@/shared/schemas/admin';
import type { AdminUnit, AdminUser } from '@/shared/types/admin';
import { problemOf } from '@/components/api/client';
import { lazyZodResolver } from '@/components/forms/lazy-resolver';
import { FormRootError } from '@/components/forms/form-root-error';
import {
  useAdminUnitsQuery,
  useAdminUsersQuery,
  useCreateUserMutation,
  useDigestSendMutation,
  useMembershipMutation,
  useUpdateUserMutation,
  useUserActionMutation,
} from '@/components/queries/admin';
import { useUser } from '@/components/auth/auth-provider';
import { formatDayTime } from '@/components/ui/format-time';
import { useTheme } from '@/components/theme/theme-provider';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { Screen } from '@/components/ui/screen';
import { Segmented } from '@/components/ui/segmented';
import { ErrorState, LoadingState } from '@/components/ui/state-view';
import { StatusBadge } from '@/components/ui/status-badge';
import { Text } from '@/components/ui/text';
import { TextField } from '@/components/ui/text-field';
import { ConfirmDialog, type PendingChange } from './confirm-dialog';
import { AuditLogCard } from './audit-log-card';
import { CreateUnitCard } from './create-unit-card';
import { UnitSettingsCard } from './unit-settings-card';
import { UploadPanel } from './upload-panel';
import { DemoMailboxLink } from '@/components/mailbox/demo-mailbox-link';

/** Users and invitations, units and settings, the roster import, the digest and the mailbox. */
export function AdminHomeScreen() {
  const search = useForm<{ q: string }>({ defaultValues: { q: '' } });
  const q = search.watch('q');
  const users = useAdminUsersQuery(q);
  const units = useAdminUnitsQuery();
  const digest = useDigestSendMutation();
  const [pending, setPending] = useState<PendingChange | null>(null);
  return (
    <Screen title="Administration" subtitle="Users, units and beds" wide>
      <Card>
        <Text variant="title" role="heading" aria-level={2}>
          Invite someone
        </Text>
        {units.data ? <InviteForm units={units.data} /> : <LoadingState />}
      </Card>
      <Card>
        <Text variant="title" role="heading" aria-level={2}>
          People
        </Text>
        <TextField control={search.control} name="q" label="Search people" hint="Part of a name or an e-mail address" autoCapitalize="none" autoCorrect={false} />
        {users.error ? (
          <ErrorState error={users.error} onRetry={() => void users.refetch()} />
        ) : !users.data ? (
          <LoadingState />
        ) : users.data.length === 0 ? (
          <Text tone="muted" role="status">
            No one matches “{q.trim()}”.
          </Text>
        ) : (
          users.data.map((u) => <UserRow key={u.id} user={u} units={units.data ?? []} onConfirm={setPending} />)
        )}
        <ConfirmDialog change={pending} onClose={() => setPending(null)} />
      </Card>
      <Card>
        <Text variant="title" role="heading" aria-level={2}>
          Import a roster
        </Text>
        <Text tone="muted">
          A CSV file with the columns name, email, role (nurse, charge, educator, admin) and unit (its name or id). You see every row checked before anyone is created; each new
          person gets an invitation.
        </Text>
        <UploadPanel label="Roster CSV" previewPath="/admin/roster/preview" importPath={(id) => `/admin/roster/${id}/import`} />
      </Card>
      {units.data?.map((u) => (
        <UnitSettingsCard key={u.id} unit={u} />
      ))}
      <CreateUnitCard />
      <AuditLogCard units={units.data ?? []} />
      <Card>
        <Text variant="title" role="heading" aria-level={2}>
          Weekly digest
        </Text>
        <Text tone="muted">Sent to each educator every Monday at 07:00 unit time: the week&apos;s figures and the review items still open.</Text>
        <Button label="Send the digest now" icon="bell" variant="secondary" busy={digest.isPending} onPress={() => digest.mutate()} />
        {digest.data ? <Text role="status">Sent {digest.data.sent} e-mails.</Text> : null}
        {digest.error ? (
          <Text tone="danger" role="alert">
            {problemOf(digest.error).message}
          </Text>
        ) : null}
      </Card>
      <DemoMailboxLink />
    </Screen>
  );
}

const createUserResolver = lazyZodResolver<CreateUserInput>((m) => m.createUserSchema);

function InviteForm({ units }: { units: AdminUnit[] }) {
  const create = useCreateUserMutation();
  const [role, setRole] = useState<Role>('nurse');
  const [unitId, setUnitId] = useState<string>(units[0]?.id ?? '');
  const [done, setDone] = useState<string | null>(null);
  const [serverFields, setServerFields] = useState<Record<string, string>>({});
  const [formError, setFormError] = useState<string | null>(null);
  const { control, handleSubmit, reset, formState } = useForm<CreateUserInput>({
    resolver: createUserResolver,
    defaultValues: { name: '', email: '', role: 'nurse', unitIds: units[0] ? [units[0].id] : [] },
  });
  const onSubmit = handleSubmit(async (values) => {
    setDone(null);
    setServerFields({});
    setFormError(null);
    try {
      const res = await create.mutateAsync({ ...values, role, unitIds: [unitId] });
      setDone(`Invitation sent to ${res.user.email}. The link works once and expires in 72 hours.`);
      reset({ name: '', email: '', role, unitIds: [unitId] });
    } catch (err) {
      const p = problemOf(err);
      if ((p.kind === 'invalid' || p.kind === 'conflict') && p.fields) setServerFields(p.fields);
      setFormError(p.message);
    }
  });
  return (
    <View style={styles.form}>
      <TextField control={control} name="name" label="Full name" serverError={serverFields.name} />
      <TextField control={control} name="email" label="Work e-mail" autoCapitalize="none" keyboardType="email-address" serverError={serverFields.email} />
      <Segmented label="Role" value={role} onChange={setRole} options={ROLES.map((r) => ({ value: r, label: ROLE_LABELS[r] }))} />
      <Segmented label="Unit" value={unitId} onChange={setUnitId} options={units.map((u) => ({ value: u.id, label: u.name }))} />
      <FormRootError control={control} />
      <Button label="Send invitation" icon="plus" onPress={() => void onSubmit()} busy={formState.isSubmitting} />
      {done ? (
        <Text tone="ok" role="status">
          {done}
        </Text>
      ) : null}
      {formError ? (
        <Text tone="danger" role="alert">
          {formError}
        </Text>
      ) : null}
    </View>
  );
}

function UserRow({ user, units, onConfirm }: { user: AdminUser; units: AdminUnit[]; onConfirm: (change: PendingChange) => void }) {
  const action = useUserActionMutation();
  const me = useUser();
  const [editing, setEditing] = useState(false);
  const unitName = (id: string) => units.find((u) => u.id === id)?.name ?? id;
  const unitNames = user.unitIds.map(unitName).join(', ');
  const tone = user.status === 'active' ? 'ok' : user.status === 'invited' ? 'warning' : 'neutral';
  const deactivate = () =>
    onConfirm({
      title: `Deactivate ${user.name}?`,
      lines: [
        `${user.name} (${user.email}) is signed out at once and cannot sign in until an administrator reactivates the account.`,
        'Everything they charted stays in the record.',
      ],
      confirmLabel: `Deactivate ${user.name}`,
      danger: true,
      run: () => action.mutateAsync({ id: user.id, action: 'deactivate' }),
    });
  return (
    <View style={styles.userRow} accessibilityLabel={`${user.name}, ${ROLE_LABELS[user.role]}`}>
      <View style={styles.userHead}>
        <Text variant="bodyStrong">{user.name}</Text>
        <StatusBadge
          tone={tone}
          icon={user.status === 'active' ? 'check' : user.status === 'invited' ? 'clock' : 'out'}
          label={user.status === 'active' ? 'Active' : user.status === 'invited' ? 'Invited' : 'Deactivated'}
        />
      </View>
      <Text tone="muted" variant="caption">
        {user.email} · {ROLE_LABELS[user.role]} · {unitNames || 'no unit'}
      </Text>
      <Text tone="muted" variant="caption">
        {user.lastSignInAt
          ? `Last signed in ${formatDayTime(user.lastSignInAt, units.find((u) => user.unitIds.includes(u.id))?.timeZone ?? units[0]?.timeZone ?? 'UTC', me.clock)}`
          : 'Never signed in'}
      </Text>
      {!user.manageable ? (
        <Text tone="muted" variant="caption">
          Also works in a unit you do not administer: only an administrator of every unit they work in can change this person.
        </Text>
      ) : (
        <View style={styles.actions}>
          <Button compact variant="quiet" label={editing ? 'Close' : 'Change role'} onPress={() => setEditing(!editing)} />
          {user.status === 'invited' ? <Button compact variant="quiet" label="Send invitation again" onPress={() => action.mutate({ id: user.id, action: 'invitation' })} /> : null}
          {user.status === 'active' ? (
            <Button compact variant="quiet" label="Send password reset" onPress={() => action.mutate({ id: user.id, action: 'password-reset' })} />
          ) : null}
          {user.active ? (
            <Button compact variant="quiet" label="Deactivate…" onPress={deactivate} />
          ) : (
            <Button compact variant="quiet" label="Reactivate" onPress={() => action.mutate({ id: user.id, action: 'reactivate' })} />
          )}
        </View>
      )}
      {user.manageable && user.id !== me.id ? <Memberships user={user} units={units} unitName={unitName} onConfirm={onConfirm} /> : null}
      {editing && user.manageable ? <AccessEditor user={user} unitName={unitName} onConfirm={onConfirm} onDone={() => setEditing(false)} /> : null}
      {action.isSuccess && action.variables?.id === user.id && action.variables.action !== 'deactivate' ? (
        <Text tone="ok" role="status" variant="caption">
          Done.
        </Text>
      ) : null}
      {action.error && action.variables?.action !== 'deactivate' ? (
        <Text tone="danger" role="alert" variant="caption">
          {problemOf(action.error).message}
        </Text>
      ) : null}
    </View>
  );
}

/** The lines a confirmation shows for a change of role or units. */
export function describeAccessChange(
  name: string,
  before: { role: Role; unitIds: string[] },
  after: { role: Role; unitIds: string[] },
  unitName: (id: string) => string,
): string[] {
  const lines: string[] = [];
  if (before.role !== after.role) lines.push(`Role: ${ROLE_LABELS[before.role]} → ${ROLE_LABELS[after.role]}.`);
  const removed = before.unitIds.filter((u) => !after.unitIds.includes(u));
  const added = after.unitIds.filter((u) => !before.unitIds.includes(u));
  if (removed.length) lines.push(`Removed from ${removed.map(unitName).join(' and ')}: ${name} no longer sees its infants.`);
  if (added.length) lines.push(`Added to ${added.map(unitName).join(' and ')}.`);
  if (lines.length) lines.push(`${name} is signed out and signs in again with the new access.`);
  return lines;
}

/**
 * Each unit the person works in, removable one at a time after a confirmation, and each other unit
 * of the administrator's to add: choosing a unit never replaces the others.
 */
function Memberships({ user, units, unitName, onConfirm }: { user: AdminUser; units: AdminUnit[]; unitName: (id: string) => string; onConfirm: (change: PendingChange) => void }) {
  const membership = useMembershipMutation();
  const theme = useTheme();
  const others = units.filter((u) => !user.unitIds.includes(u.id));
  const ask = (unitId: string, op: 'add' | 'remove') =>
    onConfirm({
      title: op === 'remove' ? `Remove ${user.name} from ${unitName(unitId)}?` : `Add ${user.name} to ${unitName(unitId)}?`,
      lines: [
        ...describeAccessChange(user.name, user, { role: user.role, unitIds: op === 'add' ? [...user.unitIds, unitId] : user.unitIds.filter((u) => u !== unitId) }, unitName),
        ...(op === 'remove'
          ? [
              `${user.name} keeps ${user.unitIds
                .filter((u) => u !== unitId)
                .map(unitName)
                .join(' and ')}.`,
            ]
          : [`${user.name} keeps ${user.unitIds.map(unitName).join(' and ')}.`]),
      ],
      confirmLabel: op === 'remove' ? `Remove from ${unitName(unitId)}` : `Add to ${unitName(unitId)}`,
      danger: op === 'remove',
      run: () => membership.mutateAsync({ userId: user.id, unitId, op }),
    });
  return (
    <View role="group" aria-label={`${user.name}'s units`} style={styles.actions}>
      {user.unitIds.map((id) => (
        <View key={id} style={[styles.chip, { borderColor: theme.colors.border }]}>
          <Text variant="caption">{unitName(id)}</Text>
          {user.unitIds.length > 1 ? <Button compact variant="quiet" label={`Remove from ${unitName(id)}…`} onPress={() => ask(id, 'remove')} /> : null}
        </View>
      ))}
      {others.map((u) => (
        <Button key={u.id} compact variant="quiet" icon="plus" label={`Add to ${u.name}…`} onPress={() => ask(u.id, 'add')} />
      ))}
    </View>
  );
}

/** The role as a draft; saving asks for confirmation first. */
function AccessEditor({
  user,
  unitName,
  onConfirm,
  onDone,
}: {
  user: AdminUser;
  unitName: (id: string) => string;
  onConfirm: (change: PendingChange) => void;
  onDone: () => void;
}) {
  const update = useUpdateUserMutation();
  const [role, setRole] = useState<Role>(user.role);
  const [hint, setHint] = useState<string | null>(null);
  const review = () => {
    const lines = describeAccessChange(user.name, user, { role, unitIds: user.unitIds }, unitName);
    if (lines.length === 0) return setHint('Nothing has changed yet.');
    setHint(null);
    const input: UpdateUserInput = { role };
    onConfirm({
      title: `Change ${user.name}'s access?`,
      lines,
      confirmLabel: 'Make the change',
      danger: true,
      run: async () => {
        await update.mutateAsync({ id: user.id, input });
        onDone();
      },
    });
  };
  return (
    <View style={styles.form}>
      <Segmented label="Role" value={role} onChange={setRole} options={ROLES.map((r) => ({ value: r, label: ROLE_LABELS[r] }))} />
      <Button compact label="Review the change…" onPress={review} />
      {hint ? (
        <Text tone="warning" role="status" variant="caption">
          {hint}
        </Text>
      ) : null}
    </View>
  );
}

const styles = StyleSheet.create({
  form: { gap: 12 },
  userRow: { gap: 4, paddingVertical: 8 },
  userHead: { flexDirection: 'row', gap: 8, alignItems: 'center', flexWrap: 'wrap' },
  actions: { flexDirection: 'row', gap: 4, flexWrap: 'wrap' },
  chip: { flexDirection: 'row', alignItems: 'center', gap: 4, paddingLeft: 10, borderRadius: 16, borderWidth: 1, minHeight: 44 },
});
