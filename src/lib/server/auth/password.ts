/**
 * Password hashing with argon2id (OWASP's recommended parameters: 19 MiB memory, 2 passes).
 */
import { hash, verify, type Options } from '@node-rs/argon2';

// `Algorithm` is a const enum this build cannot import; 2 is its Argon2id member.
const argon2id = 2 as NonNullable<Options['algorithm']>;
const options: Options = { algorithm: argon2id, memoryCost: 19_456, timeCost: 2, parallelism: 1 };

/** Hashes a password into a self-describing argon2id string. */
export function hashPassword(password: string): Promise<string> {
  return hash(password, options);
}

/** True when `password` matches `passwordHash`; false (never throws) for a malformed hash. */
export async function verifyPassword(passwordHash: string, password: string): Promise<boolean> {
  try {
    return await verify(passwordHash, password);
  } catch {
    return false;
  }
}

let decoyHash: Promise<string> | null = null;

/**
 * Spends the same time as a real verification, so an unknown e-mail cannot be told apart from a
 * wrong password by the answer's delay.
 */
export async function verifyAgainstDecoy(password: string): Promise<false> {
  decoyHash ??= hashPassword('decoy password that matches no account');
  await verifyPassword(await decoyHash, password);
  return false;
}
