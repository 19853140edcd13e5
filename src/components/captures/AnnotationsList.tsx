import { Quantity } from '../Quantity';
import type { Annotation } from './types';

export interface AnnotationsListProps {
  annotations: Annotation[];
  /** Samples per second (Hz), to show times. */
  sampleRate: number;
  /** Samples the quick look covers: annotations starting later are not drawn. */
  headSamples: number;
}

/** SigMF annotations of a capture: label, time span and frequency edges; marks those outside the quick look. */
export function AnnotationsList({ annotations, sampleRate, headSamples }: AnnotationsListProps) {
  return (
    <section aria-labelledby="annotations-title" className="rounded-lg border border-line bg-panel p-4" data-testid="annotations">
      <h3 id="annotations-title" className="font-semibold">
        Annotations <span className="font-normal text-muted">({annotations.length})</span>
      </h3>
      {annotations.length === 0 ? (
        <p className="mt-1 text-sm text-muted">None. SigMF annotations of an uploaded capture, or ones added by its owner, appear here and as dotted boxes on the spectrogram.</p>
      ) : (
        <ul className="mt-2 divide-y divide-line text-sm">
          {annotations.map((a, index) => (
            <li key={index} className="py-2">
              <div className="flex items-baseline justify-between gap-3">
                <span className="font-medium">{a.label || `Annotation ${index + 1}`}</span>
                {a.sampleStart >= headSamples && <span className="text-xs text-muted">after the quick look</span>}
              </div>
              <div className="mt-0.5 flex flex-wrap gap-x-3 text-xs text-muted">
                <span>
                  from <Quantity value={a.sampleStart / sampleRate} unit="s" />
                  {a.sampleCount !== null && (
                    <>
                      {' '}for <Quantity value={a.sampleCount / sampleRate} unit="s" />
                    </>
                  )}
                </span>
                {a.freqLowerEdge !== null && a.freqUpperEdge !== null && (
                  <span>
                    <Quantity value={a.freqLowerEdge} unit="Hz" significant={7} /> to <Quantity value={a.freqUpperEdge} unit="Hz" significant={7} />
                  </span>
                )}
              </div>
              {a.comment && <p className="mt-1 text-xs">{a.comment}</p>}
            </li>
          ))}
        </ul>
      )}
    </section>
  );
}
