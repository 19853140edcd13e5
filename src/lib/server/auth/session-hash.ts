import { createHash } from 'node:crypto';

/** SHA-256 (hex) of a session id: the only form in which a session id is ever stored. */
export function hashSessionId(sessionId: string): string {
  return createHash('sha256').update(sessionId).digest('hex');
}
