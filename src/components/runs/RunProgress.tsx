import { formatDuration } from '@/lib/units';
import type { RunStatus } from './types';

export interface RunProgressProps {
  status: RunStatus;
  /** 0..1. */
  progress: number;
  currentStage: string | null;
  /** Seconds left, or null when not known yet. */
  etaSeconds: number | null;
  /** A compact bar for table rows; the full form names the stage and the time left. */
  compact?: boolean;
}

/**
 * Progress of a run: a bar with the percentage, and (full form) what the run is doing and an
 * estimate of the time left. A queued run shows an empty bar with "waiting for a worker".
 */
export function RunProgress({ status, progress, currentStage, etaSeconds, compact }: RunProgressProps) {
  const fraction = status === 'succeeded' ? 1 : Math.min(1, Math.max(0, progress));
  const percent = Math.floor(fraction * 100);
  const tone = status === 'failed' ? 'bg-danger' : status === 'cancelled' ? 'bg-muted/60' : status === 'succeeded' ? 'bg-ok' : 'bg-accent';
  // Blocks stream through every stage at once; a stage is named only while its held-back
  // output (filter tails, last spectrum segments) is drained at the end.
  const stage = currentStage
    ? compact ? `finishing ${currentStage}` : `finishing stage ${currentStage}`
    : progress > 0 ? (compact ? 'streaming' : 'streaming through every stage') : 'starting';
  const left = etaSeconds !== null ? (compact ? `${formatDuration(etaSeconds)} left` : `about ${formatDuration(etaSeconds)} left`) : null;
  const detail = status === 'queued' ? 'waiting for a worker' : status === 'running' ? [stage, left].filter(Boolean).join(' · ') : null;
  return (
    <div className={compact ? 'w-36' : 'w-full'} data-testid="run-progress" data-progress={fraction.toFixed(3)}>
      <div className="flex items-center gap-2">
        <div
          role="progressbar"
          aria-label="Run progress"
          aria-valuemin={0}
          aria-valuemax={100}
          aria-valuenow={percent}
          aria-valuetext={`${percent} %${detail ? `, ${detail}` : ''}`}
          className={'relative flex-1 overflow-hidden rounded-full bg-line/70 ' + (compact ? 'h-1.5' : 'h-2.5')}
        >
          <div className={'h-full rounded-full transition-[width] duration-500 ease-out ' + tone} style={{ width: `${fraction * 100}%` }} />
        </div>
        <span className={'whitespace-nowrap text-right font-mono tabular-nums ' + (compact ? 'w-10 text-xs text-muted' : 'w-14 text-sm')}>{percent} %</span>
      </div>
      {detail && <p className={'mt-1 truncate text-muted ' + (compact ? 'text-[0.7rem]' : 'text-sm')}>{detail}</p>}
    </div>
  );
}
