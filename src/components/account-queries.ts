/**
 * Accounts and sessions as TanStack Query hooks over the one fetch function (apiJson): the admin's
 * accounts list is a query under `['accounts']`, creating or changing an account are mutations
 * that refresh it; signing in or out, the first setup and a password change are mutations.
 */
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { PresentedAccount } from '@/lib/server/presenters/user';
import { apiJson } from '@/components/query/fetch';

const accountKeys = { all: ['accounts'] as const };

const accountUrl = (id: string) => `/api/admin/users/${encodeURIComponent(id)}`;

/** Every account (admins only); `initial` is the list the server rendered, used without a request. */
export function useAccounts(initial: PresentedAccount[]) {
  return useQuery({
    queryKey: accountKeys.all,
    queryFn: () => apiJson<{ users: PresentedAccount[] }>('GET', '/api/admin/users').then((answer) => answer.users),
    initialData: initial,
  });
}

/** What an admin gives a new account. */
export interface NewAccount {
  email: string;
  name: string;
  role: PresentedAccount['role'];
  password: string;
}

/** Creates an account; answers it as stored and refreshes the accounts list. */
export function useCreateAccount() {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (account: NewAccount) => apiJson<{ user: PresentedAccount }>('POST', '/api/admin/users', account).then((answer) => answer.user),
    onSuccess: (created) => {
      client.setQueryData<PresentedAccount[]>(accountKeys.all, (list) => (list ? [...list.filter((a) => a.id !== created.id), created] : list));
      return client.invalidateQueries({ queryKey: accountKeys.all });
    },
  });
}

/** Changes an account's role or status; answers it as stored and refreshes the accounts list. */
export function useUpdateAccount() {
  const client = useQueryClient();
  return useMutation({
    mutationFn: ({ id, changes }: { id: string; changes: { role?: PresentedAccount['role']; disabled?: boolean } }) =>
      apiJson<{ user: PresentedAccount }>('PATCH', accountUrl(id), changes).then((answer) => answer.user),
    onSuccess: (updated) => {
      client.setQueryData<PresentedAccount[]>(accountKeys.all, (list) => list?.map((a) => (a.id === updated.id ? { ...a, ...updated } : a)));
      return client.invalidateQueries({ queryKey: accountKeys.all });
    },
  });
}

/** Signs in with e-mail and password. */
export function useSignIn() {
  return useMutation({ mutationFn: (body: { email: string; password: string }) => apiJson<{ user: unknown }>('POST', '/api/auth/sign-in', body) });
}

/** Ends the session. */
export function useSignOut() {
  return useMutation({ mutationFn: () => apiJson<null>('POST', '/api/auth/sign-out') });
}

/** Creates the first (admin) account of an installation and signs it in. */
export function useSetup() {
  return useMutation({ mutationFn: (body: { email: string; name: string; password: string }) => apiJson<unknown>('POST', '/api/setup', body) });
}

/** Changes the signed-in user's password. */
export function useChangePassword() {
  return useMutation({
    mutationFn: (body: { currentPassword: string; newPassword: string }) => apiJson<unknown>('POST', '/api/account/password', body),
  });
}
