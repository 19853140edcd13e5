/**
 * Shapes runs for API answers (the contract the run pages build on): never the row, so storage
 * keys and cache keys cannot leak. An admin looking at the whole queue sees other users' private
 * runs with the names of their private chains and captures withheld.
 */
import { access, can, type Actor } from '@/lib/permissions';
import { finishedStatuses, flag, runResource, type RunView } from './rows';
import type { PresentedRun, PresentedRunError } from '@/contracts/run';
import type { RunSummary } from '@/contracts/run-results';

export type { PresentedRun, PresentedRunError };

function iso(value: string | null): string | null {
  return value === null ? null : new Date(value).toISOString();
}

/** Seconds left (s) from the elapsed time and progress; null before 1 % (too noisy to say). */
export function estimateSecondsLeft(startedAt: string | null, progress: number, now: number = Date.now()): number | null {
  if (!startedAt || !(progress >= 0.01) || progress >= 1) return null;
  const elapsed = (now - new Date(startedAt).getTime()) / 1000;
  return Math.max(0, Math.round((elapsed * (1 - progress)) / progress));
}

/** Whether `viewer` may see an item's name: its own, a team item, or any item of a run they may read. */
function nameVisible(viewer: Actor, runVisible: boolean, ownerId: string | null, visibility: 'private' | 'team' | null): boolean {
  return runVisible || ownerId === viewer.id || visibility === 'team';
}

/** The run as `viewer` sees it, with what `viewer` may do to it. */
export function presentRun(run: RunView, viewer: Actor, summary?: RunSummary): PresentedRun {
  const resource = runResource(run);
  const visible = access(viewer, 'run.read', resource) === 'allowed';
  const active = !finishedStatuses.has(run.status);
  const owns = can(viewer, 'run.cancel', resource);
  const presented: PresentedRun = {
    id: run.id,
    chain: {
      id: run.chain_id,
      name: nameVisible(viewer, visible, run.chain_owner_id, run.chain_visibility) ? run.chain_name : 'Private chain',
      revision: run.chain_revision,
    },
    capture: {
      id: run.capture_id,
      name: nameVisible(viewer, visible, run.capture_owner_id, run.capture_visibility) ? run.capture_name : 'Private capture',
    },
    status: run.status,
    progress: Number(run.progress),
    currentStage: run.current_stage,
    etaSeconds: run.status === 'running' ? estimateSecondsLeft(run.started_at, Number(run.progress)) : null,
    requestedBy: { id: run.requested_by, name: run.requester_name },
    createdAt: iso(run.created_at)!,
    startedAt: iso(run.started_at),
    finishedAt: iso(run.finished_at),
    durationMs: run.duration_ms === null ? null : Number(run.duration_ms),
    fromCache: flag(run.from_cache),
    attempt: Number(run.attempt),
    retryOf: run.retry_of,
    error:
      run.status === 'failed' && run.error_message !== null
        ? {
            message: run.error_message,
            stageId: run.error_stage_id,
            kind: run.error_kind ?? 'internal',
            sampleIndex: run.error_sample_index === null ? null : Number(run.error_sample_index),
          }
        : null,
    permissions: {
      cancel: active && (owns || can(viewer, 'queue.manage')),
      retry: (run.status === 'failed' || run.status === 'cancelled') && owns && can(viewer, 'run.create'),
    },
  };
  if (summary !== undefined) presented.summary = summary;
  return presented;
}
