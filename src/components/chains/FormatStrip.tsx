/**
 * The strip between two cells: the sample rate and sample type that leave the stage above (what
 * the next stage is fed), its band limit when a filter set one, and the warnings and errors the
 * propagation found at that stage.
 */
import type { ChainIssue, StreamFormat } from '@/dsp/types';
import { formatQuantity } from '@/lib/units';
import { messageInCell } from './analysis';

const TYPE_LABELS: Record<StreamFormat['sampleType'], string> = { complex: 'complex', real: 'real', 'real-pair': 'two real channels' };

/** One line describing a stream format in the mono face. */
export function FormatText({ format, changedFrom }: { format: StreamFormat; changedFrom?: StreamFormat }) {
  const rateChanged = changedFrom && changedFrom.sampleRate !== format.sampleRate;
  const typeChanged = changedFrom && changedFrom.sampleType !== format.sampleType;
  return (
    <span className="font-mono text-xs tabular-nums" data-format-rate={format.sampleRate} data-format-type={format.sampleType}>
      <span className={rateChanged ? 'font-semibold text-accent' : 'text-ink'}>{formatQuantity(format.sampleRate, 'Hz', { significant: 6 })}</span>
      <span className="text-muted"> · </span>
      <span className={typeChanged ? 'font-semibold text-accent' : 'text-ink'}>{TYPE_LABELS[format.sampleType]}</span>
      {format.bandLimit !== undefined && (
        <span className="text-muted"> · band ≤ {formatQuantity(format.bandLimit, 'Hz', { significant: 5 })}</span>
      )}
      {format.centerFrequency !== undefined && <span className="text-muted"> · 0 Hz = {formatQuantity(format.centerFrequency, 'Hz', { significant: 7 })}</span>}
    </span>
  );
}

export default function FormatStrip({ output, input, issues, label }: { output?: StreamFormat; input?: StreamFormat; issues: ChainIssue[]; label: string }) {
  return (
    <div className="relative flex min-h-8 flex-col justify-center gap-1 py-1.5 pl-9" role="group" aria-label={label}>
      <span aria-hidden className="absolute bottom-0 left-[1.05rem] top-0 border-l border-dashed border-line" />
      {output ? (
        <div className="flex items-center gap-2">
          <span aria-hidden className="text-muted">↓</span>
          <FormatText format={output} changedFrom={input} />
        </div>
      ) : (
        <span className="text-xs text-muted">Choose a capture or an input format to see rates.</span>
      )}
      {issues.length > 0 && (
        <ul className="space-y-0.5">
          {issues.map((issue, n) => (
            <li
              key={n}
              className={'text-xs leading-4 ' + (issue.severity === 'error' ? 'text-danger' : 'text-amber-700 dark:text-amber-400')}
              data-issue={issue.code}
              data-severity={issue.severity}
            >
              <span className="font-semibold uppercase tracking-wide">{issue.severity === 'error' ? 'Error' : 'Warning'}</span> {messageInCell(issue)}
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
