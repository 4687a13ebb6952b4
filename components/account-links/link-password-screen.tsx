import { router } from 'expo-router';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { StyleSheet, View } from 'react-native';
import type { LinkPasswordInput } from '@/shared/schemas/auth';
import { PASSWORD_MIN_LENGTH } from '@/shared/vocabulary';
import { problemOf } from '@/components/api/client';
import { lazyZodResolver } from '@/components/forms/lazy-resolver';
import { FormRootError } from '@/components/forms/form-root-error';
import { useLinkPasswordMutation } from '@/components/queries/admin';
import { useTheme } from '@/components/theme/theme-provider';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { Icon } from '@/components/ui/icon';
import { Text } from '@/components/ui/text';
import { TextField } from '@/components/ui/text-field';

const linkPasswordResolver = lazyZodResolver<LinkPasswordInput>((m) => m.linkPasswordSchema);

/** Choose a password from an e-mailed link: accepting an invitation, or a reset. */
export function LinkPasswordScreen({ kind, token }: { kind: 'invite' | 'reset'; token: string }) {
  const theme = useTheme();
  const mutation = useLinkPasswordMutation(kind);
  const [done, setDone] = useState(false);
  const [formError, setFormError] = useState<string | null>(null);
  const [fields, setFields] = useState<Record<string, string>>({});
  const { control, handleSubmit, formState } = useForm<LinkPasswordInput>({ resolver: linkPasswordResolver, defaultValues: { token, password: '' } });
  const onSubmit = handleSubmit(async (values) => {
    setFormError(null);
    setFields({});
    try {
      await mutation.mutateAsync(values);
      setDone(true);
    } catch (err) {
      const p = problemOf(err);
      if (p.kind === 'invalid') setFields(p.fields);
      setFormError(p.kind === 'invalid' ? (p.fields.token ?? p.message) : p.message);
    }
  });
  const title = kind === 'invite' ? 'Welcome to Warmfold' : 'Choose a new password';
  return (
    <View style={[styles.page, { backgroundColor: theme.colors.background }]}>
      <View style={styles.column} role="main">
        <View style={styles.brand}>
          <Icon name="thermometer" color={theme.colors.primary} size={32} />
          <Text variant="heading" tone="primary" role="heading" aria-level={1}>
            {title}
          </Text>
        </View>
        <Card style={styles.card}>
          {!token ? (
            <Text tone="danger" role="alert">
              This link is not complete. Open it again from the e-mail, or ask your administrator for a new one.
            </Text>
          ) : done ? (
            <>
              <Text role="status">Your password is set. Sign in with your e-mail and the new password.</Text>
              <Button label="Go to sign-in" onPress={() => router.replace('/sign-in')} />
            </>
          ) : (
            <>
              <Text tone="muted">
                {kind === 'invite' ? 'Choose the password for your new account.' : 'Choose a new password. Other signed-in devices will be signed out.'} Use at least{' '}
                {PASSWORD_MIN_LENGTH} characters; a few unrelated words work well.
              </Text>
              <TextField
                control={control}
                name="password"
                label="New password"
                secureTextEntry
                autoComplete="new-password"
                textContentType="newPassword"
                serverError={fields.password}
                onSubmitEditing={() => void onSubmit()}
              />
              {formError ? (
                <Text tone="danger" role="alert">
                  {formError}
                </Text>
              ) : null}
              <FormRootError control={control} />
              <Button label={kind === 'invite' ? 'Set my password' : 'Save the new password'} onPress={() => void onSubmit()} busy={formState.isSubmitting} />
            </>
          )}
        </Card>
      </View>
    </View>
  );
}

const styles = StyleSheet.create({
  page: { flex: 1, alignItems: 'center', justifyContent: 'center', padding: 16 },
  column: { width: '100%', maxWidth: 440, gap: 16 },
  brand: { flexDirection: 'row', alignItems: 'center', gap: 10 },
  card: { gap: 16, padding: 20 },
});
