/**
 * Field schemas shared by several endpoints. Every string has a maximum length so an overlong
 * value is refused before any work (argon2 on a megabyte password would be a cheap attack).
 */
import { z } from 'zod';
import { roles } from '@/lib/permissions';
import { MAX_PASSWORD_LENGTH, MIN_PASSWORD_LENGTH } from '@/lib/password-rules';

/** An e-mail address (RFC 5321 caps a path at 254 characters). */
export const emailField = z.string().trim().min(1).max(254).email('Enter a valid e-mail address.');

/** A password being checked: any non-empty string up to 256 characters. */
export const passwordField = z.string().min(1).max(MAX_PASSWORD_LENGTH);

/** A password being set: at least MIN_PASSWORD_LENGTH characters (src/lib/password-rules.ts). */
export const newPasswordField = z.string().min(MIN_PASSWORD_LENGTH).max(MAX_PASSWORD_LENGTH);

/** A person's display name. */
export const nameField = z.string().trim().min(1).max(100);

/** One of the three roles. */
export const roleField = z.enum(roles, { errorMap: () => ({ message: `Use one of ${roles.join(', ')}.` }) });
