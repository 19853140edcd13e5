/**
 * The result cache key. A run's results depend only on what the chain computes (not its name or
 * description), the capture's bytes and the engine that ran it, so the key hashes exactly those.
 */
import { createHash } from 'node:crypto';
import { canonicalChainJson, type ChainDocument } from '@/dsp/chain';

function sha256(text: string): string {
  return createHash('sha256').update(text).digest('hex');
}

/** SHA-256 (hex) of the chain's computation-only canonical JSON. */
export function computationHash(document: ChainDocument | unknown): string {
  return sha256(canonicalChainJson(document, { computationOnly: true }));
}

/** The cache key of a chain (by computation hash) on a capture (by sha256) with an engine version. */
export function cacheKey(chainHash: string, captureSha256: string, engineVersion: string): string {
  return sha256(`quadrille-run\n${chainHash}\n${captureSha256.toLowerCase()}\n${engineVersion}`);
}
