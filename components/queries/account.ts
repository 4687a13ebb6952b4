import { useMutation } from '@tanstack/react-query';
import type { ChangePasswordInput, PreferencesInput, SessionUser } from '@/shared/schemas/auth';
import { api } from '@/components/api/client';
import { useAuth } from '@/components/auth/auth-provider';

export function usePreferencesMutation() {
  const { replaceUser } = useAuth();
  return useMutation({
    mutationFn: (input: PreferencesInput) => api<{ user: SessionUser }>('/auth/me/preferences', { method: 'PATCH', body: input }),
    onSuccess: ({ user }) => replaceUser(user),
  });
}

/** A password change ends every session, this one included. */
export function useChangePasswordMutation() {
  return useMutation({
    mutationFn: (input: ChangePasswordInput) => api<void>('/auth/me/password', { method: 'POST', body: input }),
  });
}
