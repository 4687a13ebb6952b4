import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { CreateUnitInput, CreateUserInput, UnitSettingsInput, UpdateBedInput, UpdateUserInput } from '@/shared/schemas/admin';
import type { LinkPasswordInput, RequestResetInput } from '@/shared/schemas/auth';
import type { AdminUnit, AdminUser, AuditPage, ImportResult, UploadPreview } from '@/shared/types/admin';
import { api } from '@/components/api/client';

export const ADMIN_RQKEY_ROOT = 'admin';
export const adminKeys = {
  users: () => [ADMIN_RQKEY_ROOT, 'users'] as const,
  units: () => [ADMIN_RQKEY_ROOT, 'units'] as const,
  audit: (filters: AuditFilters) => [ADMIN_RQKEY_ROOT, 'audit', filters] as const,
};

/** The audit viewer's filters: a person's id and an ISO range, each optional. */
export interface AuditFilters {
  actorId?: string;
  from?: string;
  to?: string;
}

export function useAdminUsersQuery(search = '') {
  const q = search.trim();
  return useQuery({
    queryKey: q ? [...adminKeys.users(), q] : adminKeys.users(),
    queryFn: ({ signal }) => api<{ users: AdminUser[] }>(q ? `/admin/users?q=${encodeURIComponent(q)}` : '/admin/users', { signal }).then((r) => r.users),
    placeholderData: (previous) => previous,
  });
}

/** One page of the audit log; `cursor` pages back to older events. */
export function useAuditPageQuery(filters: AuditFilters, cursor: number | null) {
  const params = new URLSearchParams({ limit: '25' });
  if (filters.actorId) params.set('actorId', filters.actorId);
  if (filters.from) params.set('from', filters.from);
  if (filters.to) params.set('to', filters.to);
  if (cursor) params.set('cursor', String(cursor));
  return useQuery({
    queryKey: [...adminKeys.audit(filters), cursor],
    queryFn: ({ signal }) => api<AuditPage>(`/admin/audit?${params.toString()}`, { signal }),
    placeholderData: (previous) => previous,
  });
}

/** Add or remove one unit membership. Invalidates the user list and the audit log. */
export function useMembershipMutation() {
  const client = useQueryClient();
  return useMutation({
    mutationFn: ({ userId, unitId, op }: { userId: string; unitId: string; op: 'add' | 'remove' }) =>
      op === 'add'
        ? api<{ unitIds: string[] }>(`/admin/users/${userId}/units`, { method: 'POST', body: { unitId } })
        : api<{ unitIds: string[] }>(`/admin/users/${userId}/units/${unitId}`, { method: 'DELETE' }),
    onSuccess: () => client.invalidateQueries({ queryKey: [ADMIN_RQKEY_ROOT] }),
  });
}

/** Rename, move, take out of use. Invalidates the units. */
export function useUpdateBedMutation() {
  const client = useQueryClient();
  return useMutation({
    mutationFn: ({ bedId, input }: { bedId: string; input: UpdateBedInput }) => api<unknown>(`/admin/beds/${bedId}`, { method: 'PATCH', body: input }),
    onSuccess: () => client.invalidateQueries({ queryKey: [ADMIN_RQKEY_ROOT] }),
  });
}

/** Invalidates the units (and the session's units are read again at the next sign-in). */
export function useCreateUnitMutation() {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (input: CreateUnitInput) => api<{ unit: AdminUnit }>('/admin/units', { method: 'POST', body: input }),
    onSuccess: () => client.invalidateQueries({ queryKey: [ADMIN_RQKEY_ROOT] }),
  });
}

export function useAdminUnitsQuery() {
  return useQuery({ queryKey: adminKeys.units(), queryFn: ({ signal }) => api<{ units: AdminUnit[] }>('/admin/units', { signal }).then((r) => r.units) });
}

/** Invalidates the user list. */
export function useCreateUserMutation() {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (input: CreateUserInput) => api<{ user: AdminUser; mailed: boolean }>('/admin/users', { method: 'POST', body: input }),
    onSuccess: () => client.invalidateQueries({ queryKey: adminKeys.users() }),
  });
}

/** Invalidates the user list. */
export function useUpdateUserMutation() {
  const client = useQueryClient();
  return useMutation({
    mutationFn: ({ id, input }: { id: string; input: UpdateUserInput }) => api<{ user: AdminUser }>(`/admin/users/${id}`, { method: 'PATCH', body: input }),
    onSuccess: () => client.invalidateQueries({ queryKey: adminKeys.users() }),
  });
}

/** deactivate, reactivate, invitation, password-reset. Invalidates the user list. */
export function useUserActionMutation() {
  const client = useQueryClient();
  return useMutation({
    mutationFn: ({ id, action }: { id: string; action: 'deactivate' | 'reactivate' | 'invitation' | 'password-reset' }) =>
      api<unknown>(`/admin/users/${id}/${action}`, { method: 'POST' }),
    onSuccess: () => client.invalidateQueries({ queryKey: adminKeys.users() }),
  });
}

/** Invalidates the units. */
export function useUnitSettingsMutation() {
  const client = useQueryClient();
  return useMutation({
    mutationFn: ({ id, input }: { id: string; input: UnitSettingsInput }) => api<{ unit: AdminUnit }>(`/admin/units/${id}`, { method: 'PATCH', body: input }),
    onSuccess: () => client.invalidateQueries({ queryKey: adminKeys.units() }),
  });
}

/** Invalidates the units. */
export function useAddBedMutation() {
  const client = useQueryClient();
  return useMutation({
    mutationFn: ({ unitId, label }: { unitId: string; label: string }) => api<unknown>(`/admin/units/${unitId}/beds`, { method: 'POST', body: { label } }),
    onSuccess: () => client.invalidateQueries({ queryKey: adminKeys.units() }),
  });
}

export function useUploadPreviewMutation(path: string) {
  return useMutation({
    mutationFn: (form: FormData) => api<UploadPreview>(path, { method: 'POST', body: form }),
  });
}

/** Invalidates the user list (a roster creates people). */
export function useUploadImportMutation(pathOf: (uploadId: string) => string) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (uploadId: string) => api<ImportResult>(pathOf(uploadId), { method: 'POST' }),
    onSuccess: () => client.invalidateQueries({ queryKey: adminKeys.users() }),
  });
}

export function useDigestSendMutation() {
  return useMutation({ mutationFn: () => api<{ sent: number; units: string[] }>('/admin/digest/send', { method: 'POST' }) });
}

/** Public: accepting an invitation or resetting a password with an e-mailed link. */
/** Ask for a reset link; the answer is the same whether or not the address has an account. */
export function useRequestResetMutation() {
  return useMutation({
    mutationFn: (input: RequestResetInput) => api<{ message: string }>('/auth/password-reset/request', { method: 'POST', body: input, skipUnauthorizedHandler: true }),
  });
}

export function useLinkPasswordMutation(kind: 'invite' | 'reset') {
  return useMutation({
    mutationFn: (input: LinkPasswordInput) =>
      api<void>(kind === 'invite' ? '/auth/invitations/accept' : '/auth/password-reset', { method: 'POST', body: input, skipUnauthorizedHandler: true }),
  });
}
