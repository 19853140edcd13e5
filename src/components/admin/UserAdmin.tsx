import { useEffect, useState } from 'react';
import type { PresentedAccount } from '@/lib/server/presenters/user';
import { FormMessage } from '../forms/Field';
import { settled } from '@/components/query/fetch';
import { withQueryClient } from '../table/withQueryClient';
import { useAccounts, useUpdateAccount } from '../account-queries';
import { ROLE_LABELS } from '../roles';
import { CreateAccountForm } from './CreateAccountForm';
import { UsersTable } from './UsersTable';

export interface UserAdminProps {
  /** Accounts as the server rendered them, so the table shows without a second request. */
  initialAccounts: PresentedAccount[];
  currentUserId: string;
}

/** The admin's accounts screen: the table of accounts and the form to create one. */
function UserAdmin({ initialAccounts, currentUserId }: UserAdminProps) {
  const accounts = useAccounts(initialAccounts).data;
  const updateAccount = useUpdateAccount();
  const [savingId, setSavingId] = useState<string | null>(null);
  const [message, setMessage] = useState<{ tone: 'error' | 'ok'; text: string } | null>(null);
  const [ready, setReady] = useState(false);
  useEffect(() => setReady(true), []);

  async function patch(account: PresentedAccount, changes: { role?: PresentedAccount['role']; disabled?: boolean }, done: string) {
    setSavingId(account.id);
    setMessage(null);
    const result = await settled(updateAccount.mutateAsync({ id: account.id, changes }));
    setSavingId(null);
    if (!result.ok) {
      setMessage({ tone: 'error', text: `${account.email}: ${result.error.message}` });
      return;
    }
    setMessage({ tone: 'ok', text: done });
  }

  function onRole(account: PresentedAccount, role: PresentedAccount['role']) {
    void patch(account, { role }, `${account.email} is now ${ROLE_LABELS[role]}.`);
  }

  function onDisabled(account: PresentedAccount, disabled: boolean) {
    if (disabled && !window.confirm(`Disable ${account.email}? They are signed out at once and cannot sign in until enabled again.`)) return;
    void patch(account, { disabled }, disabled ? `${account.email} is disabled and signed out.` : `${account.email} can sign in again.`);
  }

  return (
    <div className="grid grid-cols-1 items-start gap-8 2xl:grid-cols-[minmax(0,1fr)_24rem]">
      <section aria-labelledby="accounts-title" className="min-w-0 space-y-3">
        <div className="flex items-baseline justify-between">
          <h2 id="accounts-title" className="text-lg font-semibold">
            Accounts
          </h2>
          <span className="text-sm text-muted">
            <span className="font-mono tabular-nums">{accounts.length}</span> accounts,{' '}
            <span className="font-mono tabular-nums">{accounts.filter((a) => a.disabled).length}</span> disabled
          </span>
        </div>
        <div aria-live="polite">{message && <FormMessage tone={message.tone}>{message.text}</FormMessage>}</div>
        <UsersTable accounts={accounts} currentUserId={currentUserId} savingId={savingId} ready={ready} onRole={onRole} onDisabled={onDisabled} />
      </section>
      <section aria-labelledby="create-title" className="max-w-xl rounded-lg border border-line bg-panel p-5">
        <h2 id="create-title" className="mb-4 text-lg font-semibold">
          Create an account
        </h2>
        <CreateAccountForm ready={ready} />
      </section>
    </div>
  );
}

// Accounts change only through this screen (or another admin's): the rendered list is fresh for a while.
export default withQueryClient(UserAdmin, 30_000);
