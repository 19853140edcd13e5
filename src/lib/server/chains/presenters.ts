/**
 * Shapes chains and revisions for API answers (never the rows), including what the viewer may do
 * with a chain so pages and islands can show or hide controls without a second request. The shapes
 * are the chain contract's (src/contracts/chain.ts), which the islands read too.
 */
import { can, type Actor } from '@/lib/permissions';
import { readStoredChainDocument, type Chain, type RevisionSummary, type RevisionWithDocument } from '@/contracts/chain';
import { chainResource, type ChainWithOwner, type RevisionWithAuthor } from './rows';

function iso(value: string | Date): string {
  return new Date(value).toISOString();
}

/** The chain as `viewer` sees it. */
export function presentChain(chain: ChainWithOwner, viewer: Actor | null): Chain {
  const resource = chainResource(chain);
  return {
    id: chain.id,
    name: chain.name,
    description: chain.description,
    owner: { id: chain.owner_id, name: chain.owner_name },
    visibility: chain.visibility,
    latestRevision: Number(chain.latest_revision),
    createdAt: iso(chain.created_at),
    updatedAt: iso(chain.updated_at),
    forkedFrom:
      chain.forked_from_chain_id === null || chain.forked_from_revision === null
        ? null
        : { chainId: chain.forked_from_chain_id, revision: Number(chain.forked_from_revision) },
    permissions: {
      update: can(viewer, 'chain.update', resource),
      delete: can(viewer, 'chain.delete', resource),
      fork: can(viewer, 'chain.fork', resource),
      run: can(viewer, 'run.create', resource),
    },
  };
}

/** A revision without its document. */
export function presentRevisionSummary(revision: RevisionWithAuthor): RevisionSummary {
  return {
    chainId: revision.chain_id,
    revision: Number(revision.revision),
    message: revision.message,
    author: { id: revision.author_id, name: revision.author_name },
    createdAt: iso(revision.created_at),
    hash: revision.hash,
  };
}

/** A revision with its document. */
export function presentRevision(revision: RevisionWithAuthor): RevisionWithDocument {
  return { ...presentRevisionSummary(revision), document: readStoredChainDocument(revision.document) };
}
