import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { StyleSheet } from 'react-native';
import { ROLE_LABELS } from '@/shared/roles';
import type { ChangePasswordInput } from '@/shared/schemas/auth';
import { problemOf } from '@/components/api/client';
import { useUser } from '@/components/auth/auth-provider';
import { useSignOut } from '@/components/shell/sign-out';
import { lazyZodResolver } from '@/components/forms/lazy-resolver';
import { DemoMailboxLink } from '@/components/mailbox/demo-mailbox-link';
import { FormRootError } from '@/components/forms/form-root-error';
import { useChangePasswordMutation, usePreferencesMutation } from '@/components/queries/account';
import { useThemeChoice } from '@/components/theme/theme-provider';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { Screen } from '@/components/ui/screen';
import { Segmented } from '@/components/ui/segmented';
import { Text } from '@/components/ui/text';
import { TextField } from '@/components/ui/text-field';

export function SettingsScreen() {
  const user = useUser();
  const requestSignOut = useSignOut();
  const prefs = usePreferencesMutation();
  const { setChoice } = useThemeChoice();
  return (
    <Screen title="Settings" subtitle={`${user.name} · ${ROLE_LABELS[user.role]}`}>
      <Card style={styles.gap}>
        <Text variant="title" role="heading" aria-level={2}>
          Display
        </Text>
        <Segmented
          label="Temperature unit"
          value={user.tempUnit}
          options={[
            { value: 'C', label: '°C' },
            { value: 'F', label: '°F' },
          ]}
          onChange={(tempUnit) => prefs.mutate({ tempUnit })}
        />
        <Segmented
          label="Clock"
          value={user.clock}
          options={[
            { value: '24h', label: '24-hour' },
            { value: '12h', label: '12-hour' },
          ]}
          onChange={(clock) => prefs.mutate({ clock })}
        />
        <Segmented
          label="Theme"
          value={user.theme}
          options={[
            { value: 'system', label: 'Follow the device' },
            { value: 'light', label: 'Light' },
            { value: 'dark', label: 'Night' },
          ]}
          onChange={(theme) => {
            setChoice(theme);
            prefs.mutate({ theme });
          }}
        />
        {prefs.isError ? (
          <Text tone="danger" role="alert">
            {problemOf(prefs.error).message}
          </Text>
        ) : null}
      </Card>
      <PasswordCard onChanged={requestSignOut} />
      <DemoMailboxLink />
      <Button label="Sign out" variant="secondary" icon="out" onPress={requestSignOut} style={styles.start} />
    </Screen>
  );
}

const changePasswordResolver = lazyZodResolver<ChangePasswordInput>((m) => m.changePasswordSchema);

function PasswordCard({ onChanged }: { onChanged: () => void }) {
  const change = useChangePasswordMutation();
  const [serverFields, setServerFields] = useState<Record<string, string>>({});
  const { control, handleSubmit, reset } = useForm<ChangePasswordInput>({
    resolver: changePasswordResolver,
    defaultValues: { currentPassword: '', newPassword: '' },
  });
  const submit = handleSubmit(async (values) => {
    setServerFields({});
    try {
      await change.mutateAsync(values);
      reset();
      onChanged();
    } catch (err) {
      const p = problemOf(err);
      // Too many wrong current passwords: say so where she typed it.
      setServerFields(p.kind === 'invalid' ? p.fields : p.kind === 'too-many-requests' ? { currentPassword: p.message } : { newPassword: p.message });
    }
  });
  return (
    <Card style={styles.gap}>
      <Text variant="title" role="heading" aria-level={2}>
        Password
      </Text>
      <Text tone="muted">At least 12 characters. Changing it signs you out everywhere.</Text>
      <TextField control={control} name="currentPassword" label="Current password" secureTextEntry autoComplete="current-password" serverError={serverFields.currentPassword} />
      <TextField control={control} name="newPassword" label="New password" secureTextEntry autoComplete="new-password" serverError={serverFields.newPassword} />
      <FormRootError control={control} />
      <Button label="Change password" onPress={() => void submit()} busy={change.isPending} style={styles.start} />
    </Card>
  );
}

const styles = StyleSheet.create({ gap: { gap: 12 }, start: { alignSelf: 'flex-start' } });
