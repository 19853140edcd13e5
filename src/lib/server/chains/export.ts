/**
 * A chain revision as a downloadable file: the stored document exactly, which the command line
 * runs and `POST /api/chains` imports unchanged.
 */
import type { RevisionWithAuthor } from './rows';

/** A file-system-safe name for the export of revision `revision` of chain `chainName`. */
export function exportFileName(chainName: string, revision: number): string {
  const slug = chainName
    .normalize('NFKD')
    .replace(/[^\x20-\x7e]/g, '')
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '')
    .slice(0, 80);
  return `${slug || 'chain'}-r${revision}.chain.json`;
}

/** The download answer: the document as pretty JSON with an attachment disposition. */
export function exportResponse(chainName: string, revision: RevisionWithAuthor): Response {
  const body = JSON.stringify(JSON.parse(revision.document), null, 2) + '\n';
  return new Response(body, {
    status: 200,
    headers: {
      'Content-Type': 'application/json; charset=utf-8',
      'Content-Disposition': `attachment; filename="${exportFileName(chainName, revision.revision)}"`,
      'Cache-Control': 'no-store',
      'X-Chain-Revision-Hash': revision.hash,
    },
  });
}
