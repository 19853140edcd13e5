/** Per-user quotas: configured defaults, overrides, storage used and the next capture's allowance. */
export { defaultQuota, type Quota } from './config';
export {
  assertFits,
  captureAllowance,
  quotaError,
  quotaOf,
  quotasOf,
  setUserQuota,
  storageUsage,
  storageUsed,
  type Allowance,
  type StorageUsage,
} from './quotas';
