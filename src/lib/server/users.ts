/**
 * Accounts: creation (the first account on an empty database becomes admin), lookup, updates and
 * password changes. Functions take the database handle so the seed, scripts and tests can call them.
 */
import { randomUUID } from 'node:crypto';
import type { Knex } from 'knex';
import type { Role } from '@/lib/permissions';
import { hashPassword } from './auth/password';
import { conflict, notFound, unprocessable } from './api/errors';

export interface UserRow {
  id: string;
  email: string;
  name: string;
  role: Role;
  password_hash: string;
  disabled_at: string | null;
  last_sign_in_at: string | null;
  created_at: string;
  updated_at: string;
}

/** E-mail addresses compare case-insensitively and without surrounding blanks. */
export function normalizeEmail(email: string): string {
  return email.trim().toLowerCase();
}

/** The account with this e-mail, or undefined. */
export function findUserByEmail(db: Knex, email: string): Promise<UserRow | undefined> {
  return db<UserRow>('users').where({ email: normalizeEmail(email) }).first();
}

/** The account with this id, or undefined. */
export function findUserById(db: Knex, id: string): Promise<UserRow | undefined> {
  return db<UserRow>('users').where({ id }).first();
}

/** Number of accounts. */
export async function countUsers(db: Knex): Promise<number> {
  const row = await db('users').count<{ count: number | string }[]>({ count: '*' }).first();
  return Number(row?.count ?? 0);
}

/** Every account, oldest first. */
export function listUsers(db: Knex): Promise<UserRow[]> {
  return db<UserRow>('users').orderBy('created_at', 'asc').orderBy('email', 'asc');
}

export interface NewUser {
  email: string;
  name: string;
  role: Role;
  password: string;
}

/**
 * Creates an account. On an empty database the account becomes admin whatever role was asked,
 * so a fresh installation always has someone who can manage it. 409 `email_taken` on a duplicate.
 */
export async function createUser(db: Knex, input: NewUser): Promise<UserRow> {
  const passwordHash = await hashPassword(input.password);
  const email = normalizeEmail(input.email);
  return db.transaction(async (trx) => {
    if (await findUserByEmail(trx, email)) {
      throw conflict('email_taken', 'An account with this e-mail already exists.', 'email');
    }
    const now = new Date().toISOString();
    const row: UserRow = {
      id: randomUUID(),
      email,
      name: input.name.trim(),
      role: (await countUsers(trx)) === 0 ? 'admin' : input.role,
      password_hash: passwordHash,
      disabled_at: null,
      last_sign_in_at: null,
      created_at: now,
      updated_at: now,
    };
    await trx('users').insert(row);
    return row;
  });
}

export interface UserChanges {
  name?: string;
  role?: Role;
  disabled?: boolean;
}

/**
 * Applies an admin's changes to an account. Refuses (422 `last_admin`) to demote or disable the
 * last active admin, which would lock everyone out of administration. Disabling ends the
 * account's sessions.
 */
export async function updateUser(db: Knex, id: string, changes: UserChanges): Promise<UserRow> {
  return db.transaction(async (trx) => {
    const user = await findUserById(trx, id);
    if (!user) throw notFound('user');
    const losesAdmin =
      user.role === 'admin' && !user.disabled_at && ((changes.role && changes.role !== 'admin') || changes.disabled === true);
    if (losesAdmin) {
      const activeAdmins = await trx('users').where({ role: 'admin' }).whereNull('disabled_at').count<{ count: number }[]>({ count: '*' }).first();
      if (Number(activeAdmins?.count ?? 0) <= 1) {
        throw unprocessable('last_admin', 'This is the last active admin: make another admin first.', changes.role ? 'role' : 'disabled');
      }
    }
    const update: Partial<UserRow> = { updated_at: new Date().toISOString() };
    if (changes.name !== undefined) update.name = changes.name.trim();
    if (changes.role !== undefined) update.role = changes.role;
    if (changes.disabled === true && !user.disabled_at) update.disabled_at = update.updated_at;
    if (changes.disabled === false) update.disabled_at = null;
    await trx('users').where({ id }).update(update);
    if (changes.disabled === true) await trx('sessions').where({ user_id: id }).delete();
    return { ...user, ...update };
  });
}

/** Replaces an account's password hash and ends its sessions except `keepSessionHash` (if given). */
export async function setPassword(db: Knex, id: string, password: string, keepSessionHash?: string): Promise<void> {
  const passwordHash = await hashPassword(password);
  await db.transaction(async (trx) => {
    await trx('users').where({ id }).update({ password_hash: passwordHash, updated_at: new Date().toISOString() });
    const others = trx('sessions').where({ user_id: id });
    if (keepSessionHash) others.whereNot({ id: keepSessionHash });
    await others.delete();
  });
}

/** Records a successful sign-in time. */
export async function touchSignIn(db: Knex, id: string): Promise<void> {
  await db('users').where({ id }).update({ last_sign_in_at: new Date().toISOString() });
}
