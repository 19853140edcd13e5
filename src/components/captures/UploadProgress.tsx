import { buttonSecondary } from '../ui';
import { formatBytes, formatDuration } from '@/lib/units';
import type { TransferProgress } from './upload-transfer';

/** Progress of a transfer: bar, bytes and percentage, rate, time left, and the cancel button. */
export function UploadProgress({ progress, onCancel }: { progress: TransferProgress; onCancel: () => void }) {
  const fraction = progress.total > 0 ? progress.sent / progress.total : 0;
  const percent = Math.floor(fraction * 1000) / 10;
  return (
    <div className="mt-5 space-y-2" data-testid="upload-progress">
      <div
        role="progressbar"
        aria-label="Upload progress"
        aria-valuemin={0}
        aria-valuemax={100}
        aria-valuenow={percent}
        className="h-2.5 overflow-hidden rounded-full bg-line"
      >
        <div className="h-full rounded-full bg-accent transition-[width] duration-200" style={{ width: `${percent}%` }} />
      </div>
      <div className="flex flex-wrap items-baseline justify-between gap-x-4 gap-y-1 font-mono text-xs tabular-nums">
        <span>
          {formatBytes(progress.sent)} of {formatBytes(progress.total)} · {percent.toFixed(1)} %
        </span>
        <span className="text-muted">
          {progress.retrying
            ? 'connection lost, resuming…'
            : progress.bytesPerSecond !== null
              ? `${formatBytes(progress.bytesPerSecond)}/s · ${progress.secondsLeft !== null ? formatDuration(Math.ceil(progress.secondsLeft)) + ' left' : ''}`
              : 'measuring rate…'}
        </span>
      </div>
      <button type="button" className={buttonSecondary} onClick={onCancel}>
        Cancel upload
      </button>
    </div>
  );
}
