import { router } from 'expo-router';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { StyleSheet, View } from 'react-native';
import type { RequestResetInput } from '@/shared/schemas/auth';
import { problemOf } from '@/components/api/client';
import { lazyZodResolver } from '@/components/forms/lazy-resolver';
import { FormRootError } from '@/components/forms/form-root-error';
import { useRequestResetMutation } from '@/components/queries/admin';
import { useTheme } from '@/components/theme/theme-provider';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { Icon } from '@/components/ui/icon';
import { Text } from '@/components/ui/text';
import { TextField } from '@/components/ui/text-field';

const requestResetResolver = lazyZodResolver<RequestResetInput>((m) => m.requestResetSchema);

/**
 * Ask for a reset link by e-mail. The server answers alike whether or not the address has an
 * account, so this screen says the same thing either way.
 */
export function ForgotPasswordScreen() {
  const theme = useTheme();
  const mutation = useRequestResetMutation();
  const [sent, setSent] = useState<string | null>(null);
  const [formError, setFormError] = useState<string | null>(null);
  const [fields, setFields] = useState<Record<string, string>>({});
  const { control, handleSubmit, formState } = useForm<RequestResetInput>({ resolver: requestResetResolver, defaultValues: { email: '' } });
  const onSubmit = handleSubmit(async (values) => {
    setFormError(null);
    setFields({});
    try {
      const answer = await mutation.mutateAsync(values);
      setSent(answer.message);
    } catch (err) {
      const p = problemOf(err);
      if (p.kind === 'invalid') setFields(p.fields);
      setFormError(p.kind === 'invalid' ? (p.fields.email ?? p.message) : p.message);
    }
  });
  return (
    <View style={[styles.page, { backgroundColor: theme.colors.background }]}>
      <View style={styles.column} role="main">
        <View style={styles.brand}>
          <Icon name="thermometer" color={theme.colors.primary} size={32} />
          <Text variant="heading" tone="primary" role="heading" aria-level={1}>
            Forgot your password?
          </Text>
        </View>
        <Card style={styles.card}>
          {sent ? (
            <>
              <Text role="status">{sent} The link works once and for a limited time. If nothing arrives, ask your unit administrator.</Text>
              <Button label="Back to sign-in" onPress={() => router.replace('/sign-in')} />
            </>
          ) : (
            <>
              <Text tone="muted">Type the e-mail address you sign in with. We send a link to choose a new password.</Text>
              <TextField
                control={control}
                name="email"
                label="E-mail"
                onFocus={requestResetResolver.preload}
                autoComplete="email"
                keyboardType="email-address"
                autoCapitalize="none"
                inputMode="email"
                textContentType="username"
                serverError={fields.email}
                onSubmitEditing={() => void onSubmit()}
              />
              {formError ? (
                <Text tone="danger" role="alert">
                  {formError}
                </Text>
              ) : null}
              <FormRootError control={control} />
              <Button label="Send the reset link" onPress={() => void onSubmit()} busy={formState.isSubmitting} />
              <Button label="Back to sign-in" variant="secondary" onPress={() => router.replace('/sign-in')} />
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
