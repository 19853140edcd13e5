import { useCallback, useEffect, useMemo, useState } from 'react';
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import type { Config, Layout, PlotRelayoutEvent } from 'plotly.js-dist-min';
import Plot, { PlotPlaceholder, preloadPlotly } from '../plots/Plot';
import { usePlotTheme } from '../plots/plot-theme';
import { Quantity } from '../Quantity';
import { AnnotationsPanel, type EditingState } from './AnnotationsPanel';
import { BalanceReport } from './BalanceReport';
import { emptyAnnotationValues } from './annotation-form';
import { selectionFromRelayout, selectionValues } from './annotation-selection';
import { clippingWarning, type QuickLookResult } from './quicklook-analysis';
import { spectrogramAxes, spectrogramFigure, spectrumFigure, traceFigure } from './quicklook-figures';
import { readAnnotations, type Capture } from './types';
import { useAnnotations } from './useAnnotations';
import { useQuickLook } from './useQuickLook';
import { formatQuantity } from '@/lib/units';

export interface QuickLookProps {
  capture: Pick<Capture, 'id' | 'datatype' | 'layout' | 'sampleRate' | 'sampleCount' | 'bytesPerSample' | 'centerFrequency' | 'annotations' | 'durationSeconds' | 'permissions'>;
}

// Editors mark annotations with the box select tool, so the spectrogram keeps it in its toolbar.
const MARKING_CONFIG: Partial<Config> = { modeBarButtonsToRemove: ['lasso2d'] };

/** Plot height (CSS px): taller on wide screens, where the plots are also wider. */
function plotHeight(): number {
  return typeof window !== 'undefined' && window.innerWidth >= 1920 ? 380 : 300;
}

/**
 * Quick look of a capture, computed in the browser by the engine on the head of the capture:
 * spectrum, spectrogram with annotations, I and Q against time, balance report. Its owner or an
 * admin edits the annotations here, also by dragging a box on the spectrogram.
 * Client only: Plotly and the Web Worker need a browser.
 */
export default function QuickLook({ capture }: QuickLookProps) {
  const [client] = useState(() => new QueryClient({ defaultOptions: { queries: { retry: 1 } } }));
  return (
    <QueryClientProvider client={client}>
      <QuickLookView capture={capture} />
    </QueryClientProvider>
  );
}

function QuickLookView({ capture }: QuickLookProps) {
  const state = useQuickLook(capture);
  // Plotly loads while the head is read and analysed, not after.
  useEffect(preloadPlotly, []);
  const [plotPx] = useState(plotHeight);
  const theme = usePlotTheme();
  const canEdit = capture.permissions.update;
  const store = useAnnotations(capture.id, capture.annotations);
  const annotations = useMemo(() => readAnnotations(store.annotations), [store.annotations]);
  const [editing, setEditing] = useState<EditingState | null>(null);
  // Bumped to wipe a dragged box off the spectrogram once its form is closed.
  const [selectionRevision, setSelectionRevision] = useState(0);
  const result = state.phase === 'done' ? state.result : null;
  const clipNote = result ? clippingWarning(result.clipping, result.sampleType, result.samples) : null;
  const figures = useMemo(() => {
    if (!result) return null;
    return {
      spectrum: spectrumFigure(result, capture.centerFrequency, theme),
      spectrogram: spectrogramFigure(result, capture.centerFrequency, annotations, theme),
      trace: traceFigure(result, capture.layout, theme),
    };
  }, [result, capture.centerFrequency, capture.layout, annotations, theme]);
  const spectrogramLayout = useMemo<Partial<Layout> | undefined>(
    () =>
      figures
        ? {
            ...figures.spectrogram.layout,
            dragmode: canEdit ? 'select' : 'zoom',
            selections: [],
            // The box being marked stands apart from the white dotted boxes of saved annotations.
            newselection: { line: { color: theme.accent, width: 2, dash: 'dash' } },
            activeselection: { fillcolor: theme.accent, opacity: 0.12 },
          }
        : undefined,
    // selectionRevision is a dependency only so that a new, empty selections list is drawn.
    [figures, canEdit, selectionRevision, theme.accent],
  );
  const axes = useMemo(() => result && spectrogramAxes(result, capture.centerFrequency), [result, capture.centerFrequency]);
  const markFromSpectrogram = useCallback(
    (event: PlotRelayoutEvent) => {
      const box = selectionFromRelayout(event as Record<string, unknown>);
      const values = box && axes ? selectionValues(box, axes, capture.sampleRate) : null;
      if (!values) return;
      setEditing((open) => ({
        // A box dragged while editing moves that annotation; otherwise it starts a new one.
        index: open?.index ?? null,
        values: { ...(open?.values ?? emptyAnnotationValues()), ...values },
        key: Date.now(),
      }));
    },
    [axes, capture.sampleRate],
  );
  const changeEditing = useCallback((next: EditingState | null) => {
    setEditing(next);
    if (next === null) setSelectionRevision((n) => n + 1);
  }, []);

  const headDuration = state.headSamples / capture.sampleRate;
  const whole = state.headSamples >= capture.sampleCount;
  const pending = state.phase === 'reading' ? 'Reading the head of the capture…' : 'Analysing in the background…';

  return (
    <section
      aria-labelledby="quicklook-title"
      className="space-y-4"
      data-testid="quick-look"
      data-phase={state.phase}
      data-read-ms={state.phase === 'done' ? Math.round(state.readMs) : undefined}
      data-analysis-ms={result ? Math.round(result.elapsedMs) : undefined}
    >
      <div className="flex flex-wrap items-baseline justify-between gap-x-6 gap-y-1">
        <h2 id="quicklook-title" className="text-lg font-semibold">
          Quick look
        </h2>
        <p className="text-sm text-muted" data-testid="quick-look-label">
          {whole ? 'Quick look of all ' : 'Quick look of the first '}
          <span className="font-mono text-ink">{state.headSamples.toLocaleString('en')}</span> samples (
          <Quantity value={headDuration} unit="s" />)
          {!whole && (
            <>
              {' '}of <span className="font-mono">{capture.sampleCount.toLocaleString('en')}</span> (<Quantity value={capture.durationSeconds} unit="s" />
              ), computed in your browser; a run covers the whole capture
            </>
          )}
          .
        </p>
      </div>

      {state.phase === 'failed' && (
        <p role="alert" className="rounded-md border border-danger/40 bg-danger/10 px-3 py-2 text-sm text-danger">
          The quick look could not be made: {state.message}
        </p>
      )}

      {clipNote && (
        <p role="alert" data-testid="clipping-warning" className="rounded-md border border-danger/40 bg-danger/10 px-3 py-2 text-sm text-danger">
          {clipNote}
        </p>
      )}

      <div className="grid gap-4 2xl:grid-cols-[minmax(0,1fr)_24rem]">
        <div className="min-w-0 space-y-4">
          <PlotCard title="Spectrum" note={result ? spectrumNote(result) : undefined}>
            {figures ? (
              <Plot label="Spectrum of the capture head" testId="spectrum-plot" height={plotPx} {...figures.spectrum} />
            ) : (
              <PlotPlaceholder height={plotPx} text={state.phase === 'failed' ? 'No spectrum.' : pending} />
            )}
          </PlotCard>
          <div className="grid gap-4 xl:grid-cols-2">
            <PlotCard title="Spectrogram" note={result ? `${result.spectrogramFftSize}-point FFT, ${result.spectrogram.levels.length} rows, Hann window` : undefined}>
              {figures ? (
                <Plot
                  label="Spectrogram of the capture head"
                  testId="spectrogram-plot"
                  height={plotPx}
                  data={figures.spectrogram.data}
                  layout={spectrogramLayout}
                  config={canEdit ? MARKING_CONFIG : undefined}
                  onRelayout={canEdit ? markFromSpectrogram : undefined}
                />
              ) : (
                <PlotPlaceholder height={plotPx} text={state.phase === 'failed' ? 'No spectrogram.' : pending} />
              )}
              {canEdit && figures && (
                <p className="mt-1 text-xs text-muted" data-testid="marking-hint">
                  Drag a box to mark a new annotation; the zoom tool in the plot's toolbar zooms instead.
                </p>
              )}
            </PlotCard>
            <PlotCard title={capture.layout === 'real' ? 'Signal against time' : 'I and Q against time'} note={result ? traceNote(result.trace.samplesPerColumn) : undefined}>
              {figures ? (
                <Plot label="I and Q against time" testId="trace-plot" height={plotPx} {...figures.trace} />
              ) : (
                <PlotPlaceholder height={plotPx} text={state.phase === 'failed' ? 'No trace.' : pending} />
              )}
            </PlotCard>
          </div>
        </div>
        <div className="grid content-start items-start gap-4 lg:grid-cols-2 2xl:grid-cols-1">
          {result ? (
            <BalanceReport balance={result.balance} layout={capture.layout} samples={result.samples} sampleRate={capture.sampleRate} />
          ) : (
            <section className="rounded-lg border border-line bg-panel p-4 text-sm text-muted">
              <h3 className="font-semibold text-ink">Balance report</h3>
              <p className="mt-1">{state.phase === 'failed' ? 'Not available.' : pending}</p>
            </section>
          )}
          <AnnotationsPanel
            raw={store.annotations}
            capture={capture}
            headSamples={state.headSamples}
            canEdit={canEdit}
            editing={editing}
            onEditingChange={changeEditing}
            save={store.save}
            saving={store.saving}
          />
        </div>
      </div>
    </section>
  );
}

function PlotCard({ title, note, children }: { title: string; note?: string; children: React.ReactNode }) {
  return (
    <section className="min-w-0 rounded-lg border border-line bg-panel p-4">
      <div className="mb-2 flex flex-wrap items-baseline justify-between gap-x-4">
        <h3 className="font-semibold">{title}</h3>
        {note && <p className="font-mono text-xs text-muted">{note}</p>}
      </div>
      {children}
    </section>
  );
}

function spectrumNote(r: QuickLookResult): string {
  return `Welch, ${r.spectrumFftSize}-point Hann, RBW ${formatQuantity(r.spectrum.resolutionBandwidth, 'Hz')}, ${r.spectrum.segments} segments`;
}

function traceNote(samplesPerColumn: number): string {
  return samplesPerColumn > 1 ? `min/max of ${samplesPerColumn} samples per point` : 'every sample';
}
