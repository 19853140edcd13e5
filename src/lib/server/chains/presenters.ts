/**
 * Shapes chains and revisions for API answers (never the rows), including what the viewer may do
 * with a chain so pages and islands can show or hide controls without a second request.
 */
import { can, type Actor } from '@/lib/permissions';
import type { ChainDocument } from '@/dsp/chain';
import { storedDocument } from './document';
import { chainResource, type ChainWithOwner, type RevisionWithAuthor, type Visibility } from './rows';

/** A user as chains show them. */
export interface PersonRef {
  id: string;
  name: string;
}

/** Chain JSON. `latestRevision` counts from 1; times are ISO-8601 UTC. */
export interface PresentedChain {
  id: string;
  name: string;
  description: string;
  owner: PersonRef;
  visibility: Visibility;
  latestRevision: number;
  createdAt: string;
  updatedAt: string;
  forkedFrom: { chainId: string; revision: number } | null;
  permissions: { update: boolean; delete: boolean; fork: boolean; run: boolean };
}

/** A revision in the history list (without its document). */
export interface PresentedRevisionSummary {
  chainId: string;
  revision: number;
  message: string;
  author: PersonRef;
  createdAt: string;
  /** SHA-256 (hex) of the canonical chain JSON. */
  hash: string;
}

/** A revision with its chain document. */
export interface PresentedRevision extends PresentedRevisionSummary {
  document: ChainDocument;
}

/** Chain JSON plus the latest revision, as `GET /api/chains/:id` answers. */
export interface PresentedChainWithRevision extends PresentedChain {
  revision: PresentedRevision;
}

function iso(value: string | Date): string {
  return new Date(value).toISOString();
}

/** The chain as `viewer` sees it. */
export function presentChain(chain: ChainWithOwner, viewer: Actor | null): PresentedChain {
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
export function presentRevisionSummary(revision: RevisionWithAuthor): PresentedRevisionSummary {
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
export function presentRevision(revision: RevisionWithAuthor): PresentedRevision {
  return { ...presentRevisionSummary(revision), document: storedDocument(revision.document) };
}
