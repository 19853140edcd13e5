import { formatBytes } from '@/lib/units';
import type { StorageUsage } from './types';

/** Storage used against the quota: a bar with the figures, turning red above 90 %. */
export function StorageUsageBar({ usage }: { usage: StorageUsage }) {
  const limited = usage.quotaBytes > 0 && Number.isFinite(usage.quotaBytes);
  const fraction = limited ? Math.min(1, usage.storedBytes / usage.quotaBytes) : 0;
  const percent = Math.round(fraction * 1000) / 10;
  const high = fraction >= 0.9;
  return (
    <div className="min-w-[16rem] flex-1 text-sm" data-testid="storage-usage">
      <div className="flex flex-wrap items-baseline justify-between gap-x-4">
        <span>
          <span className="text-muted">Your storage: </span>
          <span className="font-mono tabular-nums">{formatBytes(usage.storedBytes)}</span>
          {limited && (
            <>
              <span className="text-muted"> of </span>
              <span className="font-mono tabular-nums">{formatBytes(usage.quotaBytes)}</span>
              <span className="text-muted"> ({percent} %)</span>
            </>
          )}
        </span>
        <span className="text-xs text-muted">
          {usage.captureCount} {usage.captureCount === 1 ? 'capture' : 'captures'} · largest allowed{' '}
          <span className="font-mono">{formatBytes(usage.largestCaptureBytes)}</span>
        </span>
      </div>
      {limited && (
        <div
          className="mt-1.5 h-2 overflow-hidden rounded-full bg-line"
          role="meter"
          aria-label="Storage used of your quota"
          aria-valuemin={0}
          aria-valuemax={usage.quotaBytes}
          aria-valuenow={usage.storedBytes}
          aria-valuetext={`${formatBytes(usage.storedBytes)} of ${formatBytes(usage.quotaBytes)}`}
        >
          <div className={'h-full rounded-full ' + (high ? 'bg-danger' : 'bg-accent')} style={{ width: `${Math.max(fraction > 0 ? 1 : 0, percent)}%` }} />
        </div>
      )}
    </div>
  );
}
