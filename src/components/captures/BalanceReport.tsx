import { Quantity } from '../Quantity';
import type { BalanceEstimate } from './quicklook-analysis';
import type { SampleType } from '@/dsp/types';
import { formatQuantity } from '@/lib/units';

export interface BalanceReportProps {
  balance: BalanceEstimate;
  layout: SampleType;
  /** Samples the estimate was made from. */
  samples: number;
  /** Samples per second (Hz). */
  sampleRate: number;
}

function Row({ label, children, testId }: { label: string; children: React.ReactNode; testId: string }) {
  return (
    <div className="flex items-baseline justify-between gap-4 border-b border-line py-1.5 last:border-b-0">
      <dt className="text-muted">{label}</dt>
      <dd data-testid={testId} className="text-right">
        {children}
      </dd>
    </div>
  );
}

/**
 * Balance report of a capture's head: DC offset of I and Q, gain and phase imbalance and the image
 * rejection they imply, said plainly to be estimated from the head only.
 */
export function BalanceReport({ balance, layout, samples, sampleRate }: BalanceReportProps) {
  const duration = formatQuantity(samples / sampleRate, 's');
  const iq = layout !== 'real';
  const names = layout === 'real-pair' ? ['channel 0 (I)', 'channel 1 (Q)'] : ['I', 'Q'];
  return (
    <section aria-labelledby="balance-title" className="rounded-lg border border-line bg-panel p-4" data-testid="balance-report">
      <h3 id="balance-title" className="font-semibold">
        Balance report
      </h3>
      <p className="mt-1 text-xs text-muted">
        Estimated from the first {samples.toLocaleString('en')} samples ({duration}) only, not the whole capture.
      </p>
      <dl className="mt-3 text-sm">
        <Row label={iq ? `DC offset ${names[0]}` : 'DC offset'} testId="balance-dc-i">
          <Quantity value={balance.dcIDbfs} unit="dBFS" decimals={1} />
          <span className="ml-2 font-mono text-xs text-muted">{formatFraction(balance.dcI)}</span>
        </Row>
        {iq && balance.dcQDbfs !== null && balance.dcQ !== null && (
          <Row label={`DC offset ${names[1]}`} testId="balance-dc-q">
            <Quantity value={balance.dcQDbfs} unit="dBFS" decimals={1} />
            <span className="ml-2 font-mono text-xs text-muted">{formatFraction(balance.dcQ)}</span>
          </Row>
        )}
        {iq && balance.gainImbalanceDb !== null && (
          <Row label="Gain imbalance (I relative to Q)" testId="balance-gain">
            <Quantity value={balance.gainImbalanceDb} unit="dB" decimals={2} signed />
          </Row>
        )}
        {iq && balance.phaseImbalanceDeg !== null && (
          <Row label="Phase imbalance" testId="balance-phase">
            <Quantity value={balance.phaseImbalanceDeg} unit="°" decimals={2} signed />
          </Row>
        )}
        {iq && balance.imageRejectionDb !== null && (
          <Row label="Implied image rejection" testId="balance-irr">
            {Number.isFinite(balance.imageRejectionDb) ? <Quantity value={balance.imageRejectionDb} unit="dB" decimals={1} /> : <span className="font-mono">no image (balanced)</span>}
          </Row>
        )}
      </dl>
      <p className="mt-3 text-xs text-muted">
        {iq ? (
          <>
            Blind estimate: it assumes the signal itself has equal power in I and Q and no correlation between them. A single strong
            tone close to 0 Hz, or a very short head, biases it.
            {layout === 'real-pair' && ' Channel 0 is read as I and channel 1 as Q.'}
          </>
        ) : (
          'A real-sampled capture has no Q channel: only its DC offset is reported.'
        )}
      </p>
    </section>
  );
}

/** A DC level as a signed fraction of full scale, e.g. "+0.0180 FS". */
function formatFraction(value: number): string {
  return `${value >= 0 ? '+' : '−'}${Math.abs(value).toFixed(4)} FS`;
}
