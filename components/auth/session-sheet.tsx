import { router } from 'expo-router';
import { useEffect, useId, useRef, useState } from 'react';
import { useForm } from 'react-hook-form';
import { Modal, ScrollView, StyleSheet, View, type TextInput } from 'react-native';
import { ROLE_HOME } from '@/shared/roles';
import type { SignInInput } from '@/shared/schemas/auth';
import { problemOf } from '@/components/api/client';
import { FormRootError } from '@/components/forms/form-root-error';
import { lazyZodResolver } from '@/components/forms/lazy-resolver';
import { useTheme } from '@/components/theme/theme-provider';
import { Button } from '@/components/ui/button';
import { Text } from '@/components/ui/text';
import { TextField } from '@/components/ui/text-field';
import { useAuth } from './auth-provider';

const signInResolver = lazyZodResolver<SignInInput>((m) => m.signInSchema);

/**
 * Sign-in over the screen when the server has ended the session: the page underneath stays as it
 * was, so a form keeps what was typed and a save waiting for the session goes through once the
 * same nurse has signed in. Someone else signing in here starts on their own home screen; the
 * first nurse's drafts and pending readings stay on the device, for her.
 *
 * A modal dialog: on the web react-native-web's Modal keeps focus inside; the password field
 * takes it (the e-mail is filled in with the ended session's).
 */
export function SessionSheet() {
  const { sessionEnded } = useAuth();
  const theme = useTheme();
  const titleId = useId();
  return (
    <Modal visible={sessionEnded} transparent animationType="none" onRequestClose={() => {}}>
      <View style={styles.backdrop}>
        {sessionEnded ? (
          <View role="dialog" aria-modal aria-labelledby={titleId} style={[styles.panel, { backgroundColor: theme.colors.surface, borderColor: theme.colors.border }]}>
            <SignInAgain titleId={titleId} />
          </View>
        ) : null}
      </View>
    </Modal>
  );
}

/** Mounted afresh each time the session ends: the e-mail of the ended session, an empty password. */
function SignInAgain({ titleId }: { titleId: string }) {
  const { user, signIn } = useAuth();
  const password = useRef<TextInput>(null);
  const [formError, setFormError] = useState<string | null>(null);
  const { control, handleSubmit, formState } = useForm<SignInInput>({
    resolver: signInResolver,
    defaultValues: { email: user?.email ?? '', password: '' },
  });

  useEffect(() => {
    signInResolver.preload();
    // After the Modal's own focus trap has placed focus on its first control.
    const t = setTimeout(() => password.current?.focus(), 50);
    return () => clearTimeout(t);
  }, []);

  const onSubmit = handleSubmit(async (values) => {
    setFormError(null);
    const before = user?.id;
    try {
      const signedIn = await signIn(values);
      if (signedIn.id !== before) router.replace(ROLE_HOME[signedIn.role] as '/infants');
    } catch (err) {
      const problem = problemOf(err);
      setFormError(problem.kind === 'unauthorized' ? 'That e-mail and password do not match an active account. Check both and try again.' : problem.message);
    }
  });

  return (
    <ScrollView contentContainerStyle={styles.body} keyboardShouldPersistTaps="handled">
      <Text variant="title" role="heading" aria-level={2} nativeID={titleId} id={titleId}>
        Your session ended
      </Text>
      <Text>Sign in again to carry on. What you typed stays here{user ? `, and a reading you saved is sent once ${user.name} has signed in` : ''}.</Text>
      <TextField
        control={control}
        name="email"
        label="E-mail"
        autoComplete="email"
        keyboardType="email-address"
        autoCapitalize="none"
        inputMode="email"
        textContentType="username"
      />
      <TextField
        ref={password}
        control={control}
        name="password"
        label="Password"
        secureTextEntry
        autoComplete="current-password"
        textContentType="password"
        onSubmitEditing={() => void onSubmit()}
      />
      <FormRootError control={control} />
      {formError ? (
        <Text tone="danger" role="alert">
          {formError}
        </Text>
      ) : null}
      <Button label="Sign in" onPress={() => void onSubmit()} busy={formState.isSubmitting} />
      <Text variant="caption" tone="muted">
        Someone else can sign in here too: they start on their own screens, and nothing typed here is sent under their name.
      </Text>
    </ScrollView>
  );
}

const styles = StyleSheet.create({
  // Nearly opaque: the screen kept underneath is not for whoever picks the phone up.
  backdrop: { flex: 1, alignItems: 'center', justifyContent: 'center', padding: 12, backgroundColor: 'rgba(0, 0, 0, 0.85)' },
  panel: { maxWidth: 440, width: '100%', maxHeight: '94%', borderRadius: 14, borderWidth: 1, overflow: 'hidden' },
  body: { padding: 20, gap: 14 },
});
