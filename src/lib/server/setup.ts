/**
 * First-run setup: the first account of an installation, created without signing in.
 */
import type { Knex } from 'knex';
import { countUsers, createUser, type UserRow } from './users';

export interface FirstAccount {
  email: string;
  name: string;
  password: string;
}

/** Creates the first account as admin; returns null (creating nothing) when accounts exist. */
export async function createFirstAdmin(db: Knex, input: FirstAccount): Promise<UserRow | null> {
  return db.transaction(async (trx) => {
    if ((await countUsers(trx)) > 0) return null;
    return createUser(trx, { ...input, role: 'admin' });
  });
}
