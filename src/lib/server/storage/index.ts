export type { ByteRange, ObjectInfo, ObjectRead, ObjectSource, ObjectStore, PutOptions, PutResult } from './types';
export {
  InvalidObjectKeyError,
  ObjectLengthMismatchError,
  ObjectNotFoundError,
  ObjectTooLargeError,
  RangeNotSatisfiableError,
  StorageAbortedError,
  StorageConfigError,
  StorageError,
} from './errors';
export { assertObjectKey, resolveRange } from './keys';
export { LocalFileStore } from './local-file-store';
export { S3Store, createS3Client, type S3ConnectionConfig, type S3StoreOptions } from './s3-store';
export { createObjectStore, readStorageConfig, storageConfigOf, type StorageConfig } from './config';
