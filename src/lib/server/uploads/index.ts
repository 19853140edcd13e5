/** Resumable (tus) capture uploads: the protocol endpoint, upload rows and expiry. */
export { handleTus, tusServer, UPLOADS_PATH } from './tus';
export { findUpload, storedError, type UploadRow, type UploadStatus } from './rows';
export { uploadLifetimeMs, uploadFolder } from './config';
export { sweepExpiredUploads } from './sweep';
