/**
 * Typed storage failures. Callers (upload endpoints, the quota check, the data download route)
 * tell them apart with `instanceof` and map each to one HTTP status without parsing messages.
 */

/** Base class: every failure the object store raises on purpose carries a stable `code`. */
export class StorageError extends Error {
  readonly code: string;
  constructor(code: string, message: string, options?: { cause?: unknown }) {
    super(message, options);
    this.name = new.target.name;
    this.code = code;
  }
}

/** No object is stored under the key (maps to 404). */
export class ObjectNotFoundError extends StorageError {
  readonly key: string;
  constructor(key: string, options?: { cause?: unknown }) {
    super('object_not_found', `no stored object under key "${key}"`, options);
    this.key = key;
  }
}

/** The put stream went past `maxBytes`; nothing was kept (maps to 413). */
export class ObjectTooLargeError extends StorageError {
  readonly maxBytes: number;
  constructor(maxBytes: number, detail?: string) {
    super('object_too_large', `object exceeds the limit of ${maxBytes} bytes${detail ? ` (${detail})` : ''}`);
    this.maxBytes = maxBytes;
  }
}

/** The put stream did not deliver the announced byte count; nothing was kept (maps to 400). */
export class ObjectLengthMismatchError extends StorageError {
  readonly expectedBytes: number;
  readonly receivedBytes: number;
  constructor(expectedBytes: number, receivedBytes: number) {
    super(
      'object_length_mismatch',
      `expected ${expectedBytes} bytes but the stream ${receivedBytes > expectedBytes ? 'carried more than' : 'ended after'} ${receivedBytes}`,
    );
    this.expectedBytes = expectedBytes;
    this.receivedBytes = receivedBytes;
  }
}

/** The requested byte range lies outside the object (maps to 416 with `bytes *\/size`). */
export class RangeNotSatisfiableError extends StorageError {
  readonly size: number;
  constructor(start: number, end: number, size: number) {
    super('range_not_satisfiable', `byte range ${start}-${end} is outside an object of ${size} bytes`);
    this.size = size;
  }
}

/** The key is not a safe object name (maps to 400; a programming error in most callers). */
export class InvalidObjectKeyError extends StorageError {
  readonly key: string;
  constructor(key: string, problem: string) {
    super('invalid_object_key', `object key "${key}" ${problem}`);
    this.key = key;
  }
}

/** The put was cancelled through its AbortSignal; nothing was kept. `name` is 'AbortError' like the platform's. */
export class StorageAbortedError extends StorageError {
  constructor(reason?: unknown) {
    super('aborted', 'object write was aborted', { cause: reason });
    this.name = 'AbortError';
  }
}

/** The storage configuration names a bad value (thrown at start-up, names the variable). */
export class StorageConfigError extends StorageError {
  readonly variable: string;
  constructor(variable: string, problem: string) {
    super('invalid_storage_config', `${variable} ${problem}`);
    this.variable = variable;
  }
}

/** `exists` for any store: true when `head` finds the key, false on ObjectNotFoundError. */
export async function existsByHead(store: { head(key: string): Promise<unknown> }, key: string): Promise<boolean> {
  try {
    await store.head(key);
    return true;
  } catch (error) {
    if (error instanceof ObjectNotFoundError) return false;
    throw error;
  }
}
