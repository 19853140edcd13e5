/** Errors the command line reports as one line with a non-zero exit code. */

/** A problem with the command line itself (unknown option, missing value): exit code 2. */
export class UsageError extends Error {
  override name = 'UsageError';
}

/** A problem with the input files or their contents: exit code 1. */
export class InputError extends Error {
  override name = 'InputError';
}
