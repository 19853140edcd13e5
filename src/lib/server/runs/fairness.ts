/**
 * Which queued run starts next. Users take turns (round robin): among users below their limit of
 * concurrent runs, the one served longest ago goes first, so a batch of twenty runs from one user
 * does not hold back another user's single run; within a user, runs start oldest first.
 */

export interface QueuedRun {
  id: string;
  userId: string;
}

export interface FairnessState {
  /** Runs executing now, per user id. */
  running: ReadonlyMap<string, number>;
  /** Concurrent runs each user may have (absent: no limit). */
  limits: ReadonlyMap<string, number>;
  /** A counter value per user, larger = served more recently (absent: never served). */
  lastServed: ReadonlyMap<string, number>;
}

/** The run to start next among `queued` (oldest first), or null when every user is at their limit. */
export function pickNextRun(queued: readonly QueuedRun[], state: FairnessState): QueuedRun | null {
  const firstOfUser = new Map<string, { run: QueuedRun; position: number }>();
  queued.forEach((run, position) => {
    if (!firstOfUser.has(run.userId)) firstOfUser.set(run.userId, { run, position });
  });
  let best: { run: QueuedRun; position: number; served: number } | null = null;
  for (const [userId, first] of firstOfUser) {
    const limit = state.limits.get(userId) ?? Infinity;
    if ((state.running.get(userId) ?? 0) >= limit) continue;
    const served = state.lastServed.get(userId) ?? -1;
    if (!best || served < best.served || (served === best.served && first.position < best.position)) {
      best = { ...first, served };
    }
  }
  return best?.run ?? null;
}
