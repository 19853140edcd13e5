import { useCallback, useMemo, useState } from 'react';
import { useQueryClient } from '@tanstack/react-query';
import type { Config, PlotMouseEvent, PlotRelayoutEvent } from 'plotly.js-dist-min';
import Plot, { PlotPlaceholder } from '../plots/Plot';
import { usePlotTheme } from '../plots/plot-theme';
import { formatQuantity } from '@/lib/units';
import { fetchSpectrumBins } from './api';
import { usePlotData, usePlotWidth } from './hooks';
import { MarkerPanel } from './MarkerPanel';
import { markerAt, markerAtBin, type Marker, type MarkerName, type MarkerSpectrum } from './markers';
import { PlotCard, plotConfig } from './PlotCard';
import { fromAxis, frequencyAxis, MARKER_SHAPES, spectrumFigure } from './run-figures';
import type { TestPoint } from './types';

const HEIGHT = 340;
// Marker lines are the only shapes, so letting shapes move lets the markers be dragged.
const spectrumConfig: Partial<Config> = { ...plotConfig, edits: { shapePosition: true } };

export interface SpectrumCardProps {
  runId: string;
  /** The test point with its spectrum's figures (from the run's summary). */
  probe: TestPoint & { spectrum: NonNullable<TestPoint['spectrum']> };
  fileBase: string;
}

/**
 * A probe's spectrum: the reduced trace from the plot endpoint, its peak, the noise floor (median
 * of the full spectrum, from the summary) and markers A and B placed by clicking or dragging, read
 * off the full-resolution bins, which are fetched when the first marker is placed.
 */
export function SpectrumCard({ runId, probe, fileBase }: SpectrumCardProps) {
  const theme = usePlotTheme();
  const [box, width] = usePlotWidth<HTMLDivElement>();
  const plot = usePlotData(runId, probe.stageId, 'spectrum', width);
  const [graph, setGraph] = useState<HTMLElement | null>(null);
  const [markers, setMarkers] = useState<Partial<Record<MarkerName, Marker>>>({});
  const [next, setNext] = useState<MarkerName>('A');
  const full = probe.spectrum;
  const noiseFloor = full.noiseFloor;
  const queryClient = useQueryClient();
  const [bins, setBins] = useState<MarkerSpectrum | null>(null);
  // Every bin is only needed once a marker is placed; later calls answer from the query cache.
  const loadBins = useCallback(async (): Promise<MarkerSpectrum> => {
    const loaded = await queryClient.ensureQueryData({
      queryKey: ['spectrum-bins', runId, probe.stageId],
      queryFn: () => fetchSpectrumBins(runId, probe.stageId),
    });
    setBins(loaded);
    return loaded;
  }, [queryClient, runId, probe.stageId]);
  const withBins = useCallback(
    (use: (spectrum: MarkerSpectrum) => void) => void loadBins().then(use, (error: unknown) => console.error('The spectrum bins could not be loaded:', error)),
    [loadBins],
  );
  const span = bins?.frequencies ?? plot.data?.frequencies;
  const axis = useMemo(() => frequencyAxis(probe.format, span?.[0] ?? 0, span?.[span.length - 1] ?? 1), [probe.format, span]);
  const figure = useMemo(
    () => (plot.data ? spectrumFigure({ data: plot.data, axis, noiseFloor, markers, theme }) : null),
    [plot.data, axis, noiseFloor, markers, theme],
  );

  // Placing the marker a click would place hands the next click to the other one, so two clicks
  // (or "Peak" then a click) give A and B.
  const place = useCallback((name: MarkerName, marker: Marker) => {
    setMarkers((m) => ({ ...m, [name]: marker }));
    setNext((current) => (current === name ? (name === 'A' ? 'B' : 'A') : current));
  }, []);

  const onClick = useCallback(
    (event: PlotMouseEvent) => {
      const point = event.points.find((p) => p.curveNumber === 0);
      if (!point || !plot.data) return;
      // The reduced trace keeps each column's highest bin at its true frequency, so the clicked
      // point is a bin of the full spectrum.
      const frequency = plot.data.frequencies[point.pointIndex];
      if (frequency === undefined) return;
      const name = next;
      withBins((spectrum) => place(name, markerAt(spectrum, frequency)));
    },
    [plot.data, next, place, withBins],
  );

  const onRelayout = useCallback(
    (event: PlotRelayoutEvent) => {
      const changes = event as Record<string, unknown>;
      MARKER_SHAPES.forEach((name, index) => {
        const x = changes[`shapes[${index}].x0`];
        // A dragged marker moves; it does not change which marker the next click places.
        if (typeof x === 'number') withBins((spectrum) => setMarkers((m) => ({ ...m, [name]: markerAt(spectrum, fromAxis(axis, x)) })));
      });
    },
    [withBins, axis],
  );

  const peak = full.peak;
  const note = (
    <>
      RBW {formatQuantity(full.resolutionBandwidth, 'Hz')} · {full.segments} segments · peak{' '}
      {peak.level !== null
        ? `${formatQuantity(peak.frequency + axis.offset, 'Hz', { significant: 9, signed: axis.offset === 0 })} at ${formatQuantity(peak.level, full.unit, { decimals: 1 })}`
        : 'none'}
      {noiseFloor !== null && <> · noise floor {formatQuantity(noiseFloor, full.unit, { decimals: 1 })} (median)</>}
      {plot.data && (
        <>
          {' '}
          · {plot.data.frequencies.length.toLocaleString('en')} of {full.bins.toLocaleString('en')} bins drawn
        </>
      )}
    </>
  );

  return (
    <PlotCard
      ref={box}
      title={`Spectrum at ${probe.stageId}`}
      note={note}
      graph={graph}
      fileName={`${fileBase}-spectrum-${probe.stageId}`}
      testId={`spectrum-card-${probe.stageId}`}
    >
      {figure ? (
        <Plot
          label={`Spectrum at ${probe.stageId}`}
          testId={`spectrum-plot-${probe.stageId}`}
          height={HEIGHT}
          data={figure.data}
          layout={figure.layout}
          config={spectrumConfig}
          onClick={onClick}
          onRelayout={onRelayout}
          onReady={setGraph}
        />
      ) : (
        <PlotPlaceholder height={HEIGHT} text={plot.isError ? `The spectrum could not be loaded: ${(plot.error as Error).message}` : 'Loading the spectrum…'} />
      )}
      <MarkerPanel
        markers={markers}
        next={next}
        unit={full.unit}
        axis={axis}
        binSpacing={bins && bins.frequencies.length > 1 ? bins.frequencies[1]! - bins.frequencies[0]! : 0}
        onNext={setNext}
        onStep={(name, step) => {
          const marker = markers[name];
          if (marker) withBins((spectrum) => setMarkers((m) => ({ ...m, [name]: markerAtBin(spectrum, marker.index + step) })));
        }}
        onPeak={(name) => {
          if (peak.level !== null) withBins((spectrum) => place(name, markerAt(spectrum, peak.frequency)));
        }}
        onClear={() => {
          setMarkers({});
          setNext('A');
        }}
      />
    </PlotCard>
  );
}
