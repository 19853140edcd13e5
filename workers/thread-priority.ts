/**
 * Lowers the scheduling priority of the calling thread only. On Linux the nice value belongs to each
 * thread, and setpriority() given a thread id changes just that thread, so a run worker can yield
 * the CPU to the web server's main thread (which keeps answering requests) without a child process.
 * Elsewhere, or without /proc, it does nothing.
 */
import { readlinkSync } from 'node:fs';
import { setPriority } from 'node:os';

/** Sets this thread's nice value (0..19, higher = yields more); answers whether it took effect. */
export function niceThisThread(nice: number): boolean {
  if (process.platform !== 'linux' || !(nice > 0)) return false;
  try {
    // /proc/thread-self links to "<pid>/task/<tid>".
    const tid = Number(readlinkSync('/proc/thread-self').split('/').pop());
    if (!Number.isInteger(tid) || tid <= 0) return false;
    setPriority(tid, Math.min(19, Math.round(nice)));
    return true;
  } catch {
    return false;
  }
}
