/** Captures: the commands (create from a stream, synthesize, update, delete, list), access, presenters and exports. */
export { createCapture, type CaptureIntake } from './create';
export { createSynthesizedCapture, parseSpecField, type SynthRequest } from './synthesize';
export { updateCapture, deleteCapture, deleteCaptures, checkAnnotations, type CaptureChanges } from './update';
export { listCaptures, sortKeys, type CaptureListQuery, type SortKey } from './list';
export { loadCaptureFor, refusal } from './access';
export { presentCapture } from './present';
export { DuplicateCaptureError, ingestError } from './errors';
export { getObjectStore, objectStoreForDatabase, captureObjectKey } from './store';
export { requestBody } from './request-body';
export { findCapture, findCaptures, captureQuery, type CaptureRow, type CaptureWithOwner } from './rows';
export * from './metadata';
export { uploadFormats, type UploadFormat, bytesPerSampleOf } from './ingest';
export { exportFormats, exportSigmfMeta, exportSigmfArchive, exportWav, fileStem, wavRefusal, type ExportFile, type ExportFormat } from './export';
export { captureErrorResponse, contentDisposition, webStream } from './http';
export { describeSigmf } from './ingest';
