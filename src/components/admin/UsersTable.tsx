import type { PresentedAccount } from '@/lib/server/presenters/user';
import { ROLE_LABELS } from '../roles';
import { buttonSmall } from '../ui';

type Role = PresentedAccount['role'];

interface UsersTableProps {
  accounts: PresentedAccount[];
  currentUserId: string;
  /** Id of the account whose change is being saved, to disable its controls meanwhile. */
  savingId: string | null;
  ready: boolean;
  onRole: (account: PresentedAccount, role: Role) => void;
  onDisabled: (account: PresentedAccount, disabled: boolean) => void;
}

/** All accounts with their role and status; role and status can be changed in place. */
export function UsersTable({ accounts, currentUserId, savingId, ready, onRole, onDisabled }: UsersTableProps) {
  return (
    <div className="relative overflow-x-auto rounded-lg border border-line bg-panel">
      <table className="w-full whitespace-nowrap text-sm" data-testid="users-table">
        <caption className="sr-only">Accounts</caption>
        <thead className="border-b border-line text-left text-xs uppercase tracking-wide text-muted">
          <tr>
            <th scope="col" className="px-3 py-2 font-medium">E-mail</th>
            <th scope="col" className="px-3 py-2 font-medium">Name</th>
            <th scope="col" className="px-3 py-2 font-medium">Role</th>
            <th scope="col" className="px-3 py-2 font-medium">Status</th>
            <th scope="col" className="px-3 py-2 font-medium">Created (UTC)</th>
            <th scope="col" className="px-3 py-2 font-medium">Last sign-in (UTC)</th>
            <th scope="col" className="px-3 py-2 font-medium">
              <span className="sr-only">Actions</span>
            </th>
          </tr>
        </thead>
        <tbody>
          {accounts.map((a) => {
            const self = a.id === currentUserId;
            const locked = self || savingId === a.id || !ready;
            return (
              <tr key={a.id} className="border-b border-line last:border-b-0" data-email={a.email}>
                <td className="px-3 py-2">
                  {a.email}
                  {self && <span className="ml-2 rounded bg-accent/15 px-1.5 py-0.5 text-xs text-accent">you</span>}
                </td>
                <td className="px-3 py-2">{a.name}</td>
                <td className="px-3 py-1.5">
                  {self ? (
                    <span className="px-2" title="Your own role is changed by another admin.">
                      {ROLE_LABELS[a.role]}
                    </span>
                  ) : (
                  <select
                    aria-label={`Role of ${a.email}`}
                    className="rounded border border-muted/40 bg-surface px-2 py-1 text-sm disabled:opacity-70"
                    value={a.role}
                    disabled={locked}
                    onChange={(e) => onRole(a, e.target.value as Role)}
                  >
                    {(['admin', 'engineer', 'operator'] as const).map((r) => (
                      <option key={r} value={r}>
                        {ROLE_LABELS[r]}
                      </option>
                    ))}
                  </select>
                  )}
                </td>
                <td className="px-3 py-2">
                  {a.disabled ? (
                    <span className="rounded bg-danger/10 px-1.5 py-0.5 text-xs font-medium text-danger">Disabled</span>
                  ) : (
                    <span className="rounded bg-ok/10 px-1.5 py-0.5 text-xs font-medium text-ok">Active</span>
                  )}
                </td>
                <td className="px-3 py-2 font-mono text-xs tabular-nums" title={a.createdAt}>
                  {utcMinutes(a.createdAt)}
                </td>
                <td className="px-3 py-2 text-xs text-muted" title={a.lastSignInAt ?? undefined}>
                  {a.lastSignInAt ? <span className="font-mono tabular-nums">{utcMinutes(a.lastSignInAt)}</span> : 'never'}
                </td>
                <td className="px-3 py-1.5 text-right">
                  {!self && (
                    <button type="button" className={buttonSmall} disabled={locked} onClick={() => onDisabled(a, !a.disabled)}>
                      {a.disabled ? 'Enable' : 'Disable'}
                    </button>
                  )}
                </td>
              </tr>
            );
          })}
        </tbody>
      </table>
    </div>
  );
}

/** "2026-12-01 21:50" from an ISO time: the same on server and browser, whatever the time zone. */
function utcMinutes(iso: string): string {
  return iso.slice(0, 16).replace('T', ' ');
}
