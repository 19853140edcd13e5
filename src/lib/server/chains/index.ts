/** Chains and their revisions: commands, lookups and presenters for the chain endpoints. */
export { requireChain, revisionNumber } from './access';
export { createChain, type NewChain } from './create';
export { diffRevisions } from './diff';
export { invalidChain, issueField, prepareDocument, type StoredDocument } from './document';
export { exportFileName, exportResponse } from './export';
export { forkChain, forkName, MAX_CHAIN_NAME } from './fork';
export { listChains, type ChainPage, type ChainQuery } from './list';
export { deleteChain, updateChain, type ChainChanges } from './manage';
export * from './presenters';
export { addRevision, getRevision, listRevisions, MAX_REVISION_MESSAGE, restoreRevision } from './revisions';
export { chainResource, findChain, findRevision, type ChainRow, type ChainRevisionRow, type ChainWithOwner, type RevisionWithAuthor, type Visibility } from './rows';
