/** Small display helpers of the run screens: timestamps, durations, run labels. */
import { formatDuration } from '@/lib/units';
import type { Run } from './types';

/** "2026-12-07 14:03" from an ISO timestamp, in UTC so the server's and the browser's rendering agree. */
export function utcMinute(iso: string | null): string {
  return iso ? iso.slice(0, 16).replace('T', ' ') : '—';
}

/** A run's wall time: finished runs their duration, running runs the time so far (s; none before the clock is known). */
export function elapsedSeconds(run: Pick<Run, 'status' | 'startedAt' | 'durationMs'>, now: number | null): number | null {
  if (run.durationMs !== null) return run.durationMs / 1000;
  if (run.status === 'running' && run.startedAt && now !== null) return Math.max(0, (now - Date.parse(run.startedAt)) / 1000);
  return null;
}

/** Duration text of a run, e.g. "2.31 s" or "1 min 05 s"; a dash before it starts. */
export function durationText(run: Pick<Run, 'status' | 'startedAt' | 'durationMs'>, now: number | null): string {
  const seconds = elapsedSeconds(run, now);
  return seconds === null ? '—' : formatDuration(seconds < 60 ? Number(seconds.toPrecision(3)) : seconds);
}

/** "Saltmarsh rev A … · r3": how a run is named in legends and headings (capture, chain revision). */
export function runLabel(run: Pick<Run, 'capture' | 'chain'>): string {
  return `${run.capture.name} · r${run.chain.revision}`;
}

/** The short form of a run id shown in tables and file names. */
export function shortId(id: string): string {
  return id.slice(0, 8);
}
