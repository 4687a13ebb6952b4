import { router } from 'expo-router';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { StyleSheet, View } from 'react-native';
import { ROLE_LABELS, ROLES, type Role } from '@/shared/roles';
import type { CreateUserInput } from '@/shared/schemas/admin';
import type { AdminUnit, AdminUser } from '@/shared/types/admin';
import { problemOf } from '../api/client';
import { lazyZodResolver } from '../forms/lazy-resolver';
import { FormRootError } from '../forms/form-root-error';
import { useAdminUnitsQuery, useAdminUsersQuery, useCreateUserMutation, useDigestSendMutation, useUpdateUserMutation, useUserActionMutation } from '../queries/admin';
import { Button } from '../ui/button';
import { Card } from '../ui/card';
import { Screen } from '../ui/screen';
import { Segmented } from '../ui/segmented';
import { ErrorState, LoadingState } from '../ui/state-view';
import { StatusBadge } from '../ui/status-badge';
import { Text } from '../ui/text';
import { TextField } from '../ui/text-field';
import { UnitSettingsCard } from './unit-settings-card';
import { UploadPanel } from './upload-panel';
import { DemoMailboxLink } from '@/components/mailbox/demo-mailbox-link';

/** Users and invitations, units and settings, the roster import, the digest and the mailbox. */
export function AdminHomeScreen() {
  const users = useAdminUsersQuery();
  const units = useAdminUnitsQuery();
  const digest = useDigestSendMutation();
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
        {users.error ? <ErrorState error={users.error} onRetry={() => void users.refetch()} /> : !users.data ? <LoadingState /> : users.data.map((u) => <UserRow key={u.id} user={u} units={units.data ?? []} />)}
      </Card>
      <Card>
        <Text variant="title" role="heading" aria-level={2}>
          Import a roster
        </Text>
        <Text tone="muted">A CSV file with the columns name, email, role (nurse, charge, educator, admin) and unit (its name or id). You see every row checked before anyone is created; each new person gets an invitation.</Text>
        <UploadPanel label="Roster CSV" previewPath="/admin/roster/preview" importPath={(id) => `/admin/roster/${id}/import`} />
      </Card>
      {units.data?.map((u) => <UnitSettingsCard key={u.id} unit={u} />)}
      <Card>
        <Text variant="title" role="heading" aria-level={2}>
          Weekly digest
        </Text>
        <Text tone="muted">Sent to each educator every Monday at 07:00 unit time: the week&apos;s figures and the review items still open.</Text>
        <Button label="Send the digest now" icon="bell" variant="secondary" busy={digest.isPending} onPress={() => digest.mutate()} />
        {digest.data ? <Text role="status">Sent {digest.data.sent} e-mails.</Text> : null}
        {digest.error ? <Text tone="danger" role="alert">{problemOf(digest.error).message}</Text> : null}
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
      {done ? <Text tone="ok" role="status">{done}</Text> : null}
      {formError ? <Text tone="danger" role="alert">{formError}</Text> : null}
    </View>
  );
}

function UserRow({ user, units }: { user: AdminUser; units: AdminUnit[] }) {
  const action = useUserActionMutation();
  const update = useUpdateUserMutation();
  const [editing, setEditing] = useState(false);
  const unitNames = user.unitIds.map((id) => units.find((u) => u.id === id)?.name ?? id).join(', ');
  const tone = user.status === 'active' ? 'ok' : user.status === 'invited' ? 'warning' : 'neutral';
  const error = action.error ?? update.error;
  return (
    <View style={styles.userRow} accessibilityLabel={`${user.name}, ${ROLE_LABELS[user.role]}`}>
      <View style={styles.userHead}>
        <Text variant="bodyStrong">{user.name}</Text>
        <StatusBadge tone={tone} icon={user.status === 'active' ? 'check' : user.status === 'invited' ? 'clock' : 'out'} label={user.status === 'active' ? 'Active' : user.status === 'invited' ? 'Invited' : 'Deactivated'} />
      </View>
      <Text tone="muted" variant="caption">
        {user.email} · {ROLE_LABELS[user.role]} · {unitNames || 'no unit'}
      </Text>
      <View style={styles.actions}>
        <Button compact variant="quiet" label={editing ? 'Close' : 'Change role'} onPress={() => setEditing(!editing)} />
        {user.status === 'invited' ? <Button compact variant="quiet" label="Send invitation again" onPress={() => action.mutate({ id: user.id, action: 'invitation' })} /> : null}
        {user.status === 'active' ? <Button compact variant="quiet" label="Send password reset" onPress={() => action.mutate({ id: user.id, action: 'password-reset' })} /> : null}
        {user.active ? (
          <Button compact variant="quiet" label="Deactivate" onPress={() => action.mutate({ id: user.id, action: 'deactivate' })} />
        ) : (
          <Button compact variant="quiet" label="Reactivate" onPress={() => action.mutate({ id: user.id, action: 'reactivate' })} />
        )}
      </View>
      {editing ? (
        <View style={styles.form}>
          <Segmented label="Role" value={user.role} onChange={(role) => update.mutate({ id: user.id, input: { role } })} options={ROLES.map((r) => ({ value: r, label: ROLE_LABELS[r] }))} />
          <Segmented label="Unit" value={user.unitIds.length === 1 ? user.unitIds[0]! : null} onChange={(unitId) => update.mutate({ id: user.id, input: { unitIds: [unitId] } })} options={units.map((u) => ({ value: u.id, label: u.name }))} />
        </View>
      ) : null}
      {action.isSuccess && action.variables?.id === user.id ? <Text tone="ok" role="status" variant="caption">Done.</Text> : null}
      {error ? <Text tone="danger" role="alert" variant="caption">{problemOf(error).message}</Text> : null}
    </View>
  );
}

const styles = StyleSheet.create({
  form: { gap: 12 },
  userRow: { gap: 4, paddingVertical: 8 },
  userHead: { flexDirection: 'row', gap: 8, alignItems: 'center', flexWrap: 'wrap' },
  actions: { flexDirection: 'row', gap: 4, flexWrap: 'wrap' },
});
