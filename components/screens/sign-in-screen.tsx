import { router } from 'expo-router';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { KeyboardAvoidingView, StyleSheet, View } from 'react-native';
import type { SignInInput } from '@/shared/schemas/auth';
import { problemOf } from '@/components/api/client';
import { useAuth } from '@/components/auth/auth-provider';
import { lazyZodResolver } from '@/components/forms/lazy-resolver';
import { FormRootError } from '@/components/forms/form-root-error';
import { useTheme } from '@/components/theme/theme-provider';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { Icon } from '@/components/ui/icon';
import { Text } from '@/components/ui/text';
import { TextField } from '@/components/ui/text-field';

const signInResolver = lazyZodResolver<SignInInput>((m) => m.signInSchema);

export function SignInScreen() {
  const theme = useTheme();
  const { signIn, endedMessage } = useAuth();
  const [formError, setFormError] = useState<string | null>(null);
  const { control, handleSubmit, formState } = useForm<SignInInput>({
    resolver: signInResolver,
    defaultValues: { email: '', password: '' },
  });

  const onSubmit = handleSubmit(async (values) => {
    setFormError(null);
    try {
      await signIn(values);
    } catch (err) {
      const problem = problemOf(err);
      setFormError(problem.kind === 'unauthorized' ? 'That e-mail and password do not match an active account. Check both and try again.' : problem.message);
    }
  });

  return (
    <KeyboardAvoidingView style={[styles.page, { backgroundColor: theme.colors.background }]} behavior="padding">
      <View style={styles.column} role="main">
        <View style={styles.brand}>
          <Icon name="thermometer" color={theme.colors.primary} size={36} />
          <Text variant="heading" tone="primary" role="heading" aria-level={1}>
            Warmfold
          </Text>
        </View>
        <Text tone="muted">Thermal care charting for the neonatal unit.</Text>
        <Card style={styles.card}>
          <Text variant="title" role="heading" aria-level={2}>
            Sign in
          </Text>
          {endedMessage && !formError ? (
            <Text tone="warning" role="status">
              {endedMessage}
            </Text>
          ) : null}
          <TextField
            control={control}
            name="email"
            label="E-mail"
            // The checks load while she types, not before the form draws.
            onFocus={signInResolver.preload}
            autoComplete="email"
            keyboardType="email-address"
            autoCapitalize="none"
            inputMode="email"
            textContentType="username"
          />
          <TextField
            control={control}
            name="password"
            label="Password"
            onFocus={signInResolver.preload}
            secureTextEntry
            autoComplete="current-password"
            textContentType="password"
            onSubmitEditing={() => void onSubmit()}
          />
          <FormRootError control={control} />
          {formError ? (
            <View style={[styles.error, { backgroundColor: theme.colors.dangerSoft, borderColor: theme.colors.danger }]} role="alert">
              <Icon name="alert" color={theme.colors.danger} />
              <Text tone="danger" style={styles.errorText}>
                {formError}
              </Text>
            </View>
          ) : null}
          <Button label="Sign in" onPress={() => void onSubmit()} busy={formState.isSubmitting} />
        </Card>
        <Button label="Forgot your password?" variant="quiet" onPress={() => router.push('/forgot-password')} />
      </View>
    </KeyboardAvoidingView>
  );
}

const styles = StyleSheet.create({
  page: { flex: 1, alignItems: 'center', justifyContent: 'center', padding: 16 },
  column: { width: '100%', maxWidth: 420, gap: 16 },
  brand: { flexDirection: 'row', alignItems: 'center', gap: 10 },
  card: { gap: 16, padding: 20 },
  error: { flexDirection: 'row', gap: 8, padding: 10, borderRadius: 10, borderWidth: 1.5, alignItems: 'flex-start' },
  errorText: { flex: 1 },
});
