/** Password rules shared by the server's checks and the forms that ask for a new password. */

/** Fewest characters of a new password (common practice for a password-only sign-in). */
export const MIN_PASSWORD_LENGTH = 10;
/** Most characters a password may have (keeps hashing time bounded). */
export const MAX_PASSWORD_LENGTH = 256;
