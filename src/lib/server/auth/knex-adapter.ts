/**
 * lucia 3 adapter over Knex. lucia hands over the session id it put in the cookie; this adapter
 * keys every row by the SHA-256 of that id, so the sessions table alone opens no session.
 * A session found by cookie keeps the cookie's id (lucia refreshes and deletes it by that id); a
 * session listed by user carries its hash, since the id itself is nowhere stored.
 */
import type { Adapter, DatabaseSession, DatabaseUser } from 'lucia';
import type { Knex } from 'knex';
import { hashSessionId } from './session-hash';
import type { UserRow } from '../users';

interface SessionRow {
  id: string;
  user_id: string;
  expires_at: string | Date;
}

/** The row key for an id lucia hands back: a cookie's id, or a hash it listed earlier. */
function rowKey(sessionId: string): string {
  // lucia ids are 40 base32 characters; 64 hex digits can only be a stored hash.
  return /^[0-9a-f]{64}$/.test(sessionId) ? sessionId : hashSessionId(sessionId);
}

function toDatabaseSession(row: SessionRow, id: string = row.id): DatabaseSession {
  return { id, userId: row.user_id, expiresAt: new Date(row.expires_at), attributes: {} };
}

function toDatabaseUser(row: UserRow): DatabaseUser {
  return {
    id: row.id,
    attributes: { email: row.email, name: row.name, role: row.role, disabled_at: row.disabled_at },
  };
}

/** A lucia adapter storing sessions in the `sessions` table of `db`. */
export function createKnexAdapter(db: Knex): Adapter {
  return {
    async getSessionAndUser(sessionId) {
      const session = await db<SessionRow>('sessions').where({ id: hashSessionId(sessionId) }).first();
      if (!session) return [null, null];
      const user = await db<UserRow>('users').where({ id: session.user_id }).first();
      return [toDatabaseSession(session, sessionId), user ? toDatabaseUser(user) : null];
    },
    async getUserSessions(userId) {
      const rows = await db<SessionRow>('sessions').where({ user_id: userId });
      return rows.map((row) => toDatabaseSession(row));
    },
    async setSession(session) {
      await db('sessions').insert({
        id: hashSessionId(session.id),
        user_id: session.userId,
        expires_at: session.expiresAt.toISOString(),
      });
    },
    async updateSessionExpiration(sessionId, expiresAt) {
      await db('sessions').where({ id: rowKey(sessionId) }).update({ expires_at: expiresAt.toISOString() });
    },
    async deleteSession(sessionId) {
      await db('sessions').where({ id: rowKey(sessionId) }).delete();
    },
    async deleteUserSessions(userId) {
      await db('sessions').where({ user_id: userId }).delete();
    },
    async deleteExpiredSessions() {
      await db('sessions').where('expires_at', '<=', new Date().toISOString()).delete();
    },
  };
}
