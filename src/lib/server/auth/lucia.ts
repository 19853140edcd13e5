/**
 * The lucia instance: sessions of 30 days, refreshed when past half their life, in an httpOnly,
 * SameSite=Lax cookie that is Secure in production.
 */
import { Lucia, TimeSpan } from 'lucia';
import type { Knex } from 'knex';
import type { Role } from '@/lib/permissions';
import { getDb } from '../db';
import { isProduction } from '../config';
import { createKnexAdapter } from './knex-adapter';

/** Name of the session cookie. */
export const sessionCookieName = 'quadrille_session';

function createLucia(db: Knex) {
  return new Lucia(createKnexAdapter(db), {
    sessionExpiresIn: new TimeSpan(30, 'd'),
    sessionCookie: { name: sessionCookieName, attributes: { secure: isProduction(), sameSite: 'lax' } },
    getUserAttributes: (attributes) => ({
      email: attributes.email,
      name: attributes.name,
      role: attributes.role,
      disabled: attributes.disabled_at !== null,
    }),
  });
}

declare module 'lucia' {
  interface Register {
    Lucia: ReturnType<typeof createLucia>;
    DatabaseUserAttributes: { email: string; name: string; role: Role; disabled_at: string | null };
  }
}

let instance: ReturnType<typeof createLucia> | null = null;

/** The server's lucia instance over the shared database. */
export function getLucia() {
  instance ??= createLucia(getDb());
  return instance;
}
