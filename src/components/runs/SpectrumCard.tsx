import { useCallback, useMemo, useState } from 'react';
import type { Config, PlotMouseEvent, PlotRelayoutEvent } from 'plotly.js-dist-min';
import Plot, { PlotPlaceholder } from '../plots/Plot';
import { usePlotTheme } from '../plots/plot-theme';
import { formatQuantity } from '@/lib/units';
import { usePlotData, usePlotWidth } from './hooks';
import { MarkerPanel } from './MarkerPanel';
import { markerAt, markerAtBin, medianLevel, type Marker, type MarkerName } from './markers';
import { PlotCard, plotConfig } from './PlotCard';
import { fromAxis, frequencyAxis, MARKER_SHAPES, spectrumFigure } from './run-figures';
import type { ResultProbe } from './types';

const HEIGHT = 340;
// Marker lines are the only shapes, so letting shapes move lets the markers be dragged.
const spectrumConfig: Partial<Config> = { ...plotConfig, edits: { shapePosition: true } };

export interface SpectrumCardProps {
  runId: string;
  /** The probe with its full-resolution spectrum (from the run's results). */
  probe: ResultProbe & { spectrum: NonNullable<ResultProbe['spectrum']> };
  fileBase: string;
}

/**
 * A probe's spectrum: the reduced trace from the plot endpoint, its peak, the noise floor (median
 * of the full spectrum) and markers A and B placed by clicking or dragging, read off the
 * full-resolution bins.
 */
export function SpectrumCard({ runId, probe, fileBase }: SpectrumCardProps) {
  const theme = usePlotTheme();
  const [box, width] = usePlotWidth<HTMLDivElement>();
  const plot = usePlotData(runId, probe.stageId, 'spectrum', width);
  const [graph, setGraph] = useState<HTMLElement | null>(null);
  const [markers, setMarkers] = useState<Partial<Record<MarkerName, Marker>>>({});
  const [next, setNext] = useState<MarkerName>('A');
  const full = probe.spectrum;
  const noiseFloor = useMemo(() => medianLevel(full.levels), [full.levels]);
  const axis = useMemo(
    () => frequencyAxis(probe.format, full.frequencies[0] ?? 0, full.frequencies[full.frequencies.length - 1] ?? 1),
    [probe.format, full.frequencies],
  );
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
      place(next, markerAt(full, frequency));
    },
    [plot.data, full, next, place],
  );

  const onRelayout = useCallback(
    (event: PlotRelayoutEvent) => {
      const changes = event as Record<string, unknown>;
      MARKER_SHAPES.forEach((name, index) => {
        const x = changes[`shapes[${index}].x0`];
        // A dragged marker moves; it does not change which marker the next click places.
        if (typeof x === 'number') setMarkers((m) => ({ ...m, [name]: markerAt(full, fromAxis(axis, x)) }));
      });
    },
    [full, axis],
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
          · {plot.data.frequencies.length.toLocaleString('en')} of {full.frequencies.length.toLocaleString('en')} bins drawn
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
        binSpacing={full.frequencies.length > 1 ? full.frequencies[1]! - full.frequencies[0]! : 0}
        onNext={setNext}
        onStep={(name, step) => {
          const marker = markers[name];
          if (marker) setMarkers((m) => ({ ...m, [name]: markerAtBin(full, marker.index + step) }));
        }}
        onPeak={(name) => {
          if (peak.level !== null) place(name, markerAt(full, peak.frequency));
        }}
        onClear={() => {
          setMarkers({});
          setNext('A');
        }}
      />
    </PlotCard>
  );
}
