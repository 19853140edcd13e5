/**
 * Shapes accounts for API answers: never the row itself, so a new column (or the password hash)
 * cannot leak by accident.
 */
import type { Role } from '@/lib/permissions';
import type { UserRow } from '../users';

/** What a signed-in user learns about themselves (`GET /api/me`). */
export interface PresentedUser {
  id: string;
  email: string;
  name: string;
  role: Role;
}

/** What an admin sees in the account list. */
export interface PresentedAccount extends PresentedUser {
  disabled: boolean;
  disabledAt: string | null;
  lastSignInAt: string | null;
  createdAt: string;
}

function isoOrNull(value: string | Date | null): string | null {
  return value === null ? null : new Date(value).toISOString();
}

/** The public face of an account. */
export function presentUser(user: Pick<UserRow, 'id' | 'email' | 'name' | 'role'>): PresentedUser {
  return { id: user.id, email: user.email, name: user.name, role: user.role };
}

/** An account as the admin pages show it. */
export function presentAccount(user: UserRow): PresentedAccount {
  return {
    ...presentUser(user),
    disabled: user.disabled_at !== null,
    disabledAt: isoOrNull(user.disabled_at),
    lastSignInAt: isoOrNull(user.last_sign_in_at),
    createdAt: new Date(user.created_at).toISOString(),
  };
}
