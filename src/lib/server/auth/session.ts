/**
 * Session helpers used by the middleware and the auth endpoints: read the cookie, validate it,
 * start and end sessions.
 */
import type { AstroCookies } from 'astro';
import type { Session, User } from 'lucia';
import type { Role } from '@/lib/permissions';
import { getLucia, sessionCookieName } from './lucia';

/** The signed-in user as pages and endpoints see it (`Astro.locals.user`). */
export interface SessionUser {
  id: string;
  email: string;
  name: string;
  role: Role;
}

export interface ValidatedSession {
  user: SessionUser | null;
  session: Session | null;
}

function toSessionUser(user: User): SessionUser {
  return { id: user.id, email: user.email, name: user.name, role: user.role };
}

/**
 * Validates the session cookie, refreshing it when lucia extended the session and clearing it
 * when it is expired, forged or belongs to a disabled account.
 */
export async function validateSessionCookie(cookies: AstroCookies): Promise<ValidatedSession> {
  const sessionId = cookies.get(sessionCookieName)?.value ?? null;
  if (!sessionId) return { user: null, session: null };
  const lucia = getLucia();
  const { session, user } = await lucia.validateSession(sessionId);
  if (!session || !user || user.disabled) {
    if (session) await lucia.invalidateSession(session.id);
    clearSessionCookie(cookies);
    return { user: null, session: null };
  }
  if (session.fresh) setSessionCookie(cookies, session.id);
  return { user: toSessionUser(user), session };
}

/** Starts a session for `userId` and sets its cookie. */
export async function startSession(cookies: AstroCookies, userId: string): Promise<Session> {
  const session = await getLucia().createSession(userId, {});
  setSessionCookie(cookies, session.id);
  return session;
}

/** Ends `session` (if any) and clears the cookie. */
export async function endSession(cookies: AstroCookies, session: Session | null): Promise<void> {
  if (session) await getLucia().invalidateSession(session.id);
  clearSessionCookie(cookies);
}

function setSessionCookie(cookies: AstroCookies, sessionId: string): void {
  const cookie = getLucia().createSessionCookie(sessionId);
  cookies.set(cookie.name, cookie.value, cookie.attributes);
}

function clearSessionCookie(cookies: AstroCookies): void {
  const cookie = getLucia().createBlankSessionCookie();
  cookies.set(cookie.name, cookie.value, cookie.attributes);
}
