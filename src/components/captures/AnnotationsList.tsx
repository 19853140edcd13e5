import type { ReactNode } from 'react';
import { Quantity } from '../Quantity';
import { buttonSmall } from '../ui';
import type { Annotation } from './types';

/** Edit controls of the list, for the owner or an admin. */
export interface AnnotationControls {
  onAdd: () => void;
  onEdit: (index: number) => void;
  onDelete: (index: number) => void;
  /** The annotation whose form is open (highlighted), or null. */
  editingIndex: number | null;
  /** While a save runs, the buttons wait. */
  busy: boolean;
}

export interface AnnotationsListProps {
  annotations: Annotation[];
  /** Samples per second (Hz), to show times. */
  sampleRate: number;
  /** Samples the quick look covers: annotations starting later are not drawn. */
  headSamples: number;
  /** Absent for readers: the list is shown without edit controls. */
  controls?: AnnotationControls;
  /** The open annotation form, shown above the list. */
  children?: ReactNode;
}

/** SigMF annotations of a capture: label, time span and frequency edges; marks those outside the quick look. */
export function AnnotationsList({ annotations, sampleRate, headSamples, controls, children }: AnnotationsListProps) {
  return (
    <section aria-labelledby="annotations-title" className="rounded-lg border border-line bg-panel p-4" data-testid="annotations">
      <div className="flex items-baseline justify-between gap-3">
        <h3 id="annotations-title" className="font-semibold">
          Annotations <span className="font-normal text-muted" data-testid="annotations-count">({annotations.length})</span>
        </h3>
        {controls && (
          <button type="button" className={buttonSmall} onClick={controls.onAdd} disabled={controls.busy}>
            Add annotation
          </button>
        )}
      </div>
      {children && <div className="mt-3">{children}</div>}
      {annotations.length === 0 ? (
        <p className="mt-1 text-sm text-muted">
          {controls
            ? 'None yet. Drag a box on the spectrogram, or press Add annotation, to mark a burst or an interferer.'
            : 'None. SigMF annotations of an uploaded capture, or ones added by its owner, appear here and as dotted boxes on the spectrogram.'}
        </p>
      ) : (
        <ul className="mt-2 divide-y divide-line text-sm">
          {annotations.map((a, index) => {
            const name = a.label || `Annotation ${index + 1}`;
            return (
              <li key={index} className={'py-2' + (controls?.editingIndex === index ? ' -mx-2 rounded bg-accent/10 px-2' : '')} data-testid="annotation-item">
                <div className="flex items-baseline justify-between gap-3">
                  <span className="font-medium">{name}</span>
                  <span className="flex shrink-0 items-baseline gap-2">
                    {a.sampleStart >= headSamples && <span className="text-xs text-muted">after the quick look</span>}
                    {controls && (
                      <>
                        <button type="button" className={buttonSmall} onClick={() => controls.onEdit(index)} disabled={controls.busy} aria-label={`Edit ${name}`}>
                          Edit
                        </button>
                        <button type="button" className={buttonSmall} onClick={() => controls.onDelete(index)} disabled={controls.busy} aria-label={`Delete ${name}`}>
                          Delete
                        </button>
                      </>
                    )}
                  </span>
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
            );
          })}
        </ul>
      )}
    </section>
  );
}
