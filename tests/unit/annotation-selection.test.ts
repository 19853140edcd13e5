/**
 * A box dragged on the quick-look spectrogram read back into a new annotation: axis units (MHz of
 * RF frequency, ms from the start) scaled to Hz and seconds, clipped to the plotted data.
 */
import { describe, expect, it } from 'vitest';
import { selectionFromRelayout, selectionValues, type SpectrogramAxes } from '@/components/captures/annotation-selection';

// The demo's rev A quick look: 262,144 samples at 4 Msps (65.536 ms) around 2.412 GHz, plotted in MHz and ms.
const axes: SpectrogramAxes = { frequencyDivisor: 1e6, timeDivisor: 1e-3, frequencyLow: 2.41e9, frequencyHigh: 2.414e9, duration: 0.065536 };

describe('selectionFromRelayout', () => {
  it('reads the rectangle Plotly reports after a box select', () => {
    const event = { selections: [{ xref: 'x', yref: 'y', type: 'rect', x0: 2412.5, y0: 30, x1: 2412.7, y1: 10 }] };
    expect(selectionFromRelayout(event)).toEqual({ x0: 2412.5, x1: 2412.7, y0: 30, y1: 10 });
  });

  it('ignores zooms and cleared selections', () => {
    expect(selectionFromRelayout({ 'xaxis.range[0]': 2411, 'xaxis.range[1]': 2413 })).toBeNull();
    expect(selectionFromRelayout({ selections: [] })).toBeNull();
  });
});

describe('selectionValues', () => {
  it('turns axis units into times and RF edges, rounded to a thousandth of the plotted span', () => {
    // y 10.0012..12.5034 ms rounds to 10 µs steps, x 2412.56789..2412.91234 MHz to 1 kHz steps.
    const values = selectionValues({ x0: 2412.91234, x1: 2412.56789, y0: 12.5034, y1: 10.0012 }, axes, 4e6);
    expect(values).toEqual({ start: '10 ms', duration: '2.5 ms', lowerEdge: '2.412568 GHz', upperEdge: '2.412912 GHz' });
  });

  it('clips a box that overhangs the data to what the spectrogram covers', () => {
    const values = selectionValues({ x0: 2409, x1: 2415, y0: -3, y1: 80 }, axes, 4e6);
    // The whole head: 262,144 samples at 4 Msps = 65.536 ms.
    expect(values).toEqual({ start: '0 s', duration: '65.536 ms', lowerEdge: '2.41 GHz', upperEdge: '2.414 GHz' });
  });

  it('reads offsets from 0 Hz when the centre frequency is unknown (axis in kHz)', () => {
    const offsets: SpectrogramAxes = { frequencyDivisor: 1e3, timeDivisor: 1e-3, frequencyLow: -500e3, frequencyHigh: 500e3, duration: 0.01 };
    expect(selectionValues({ x0: -120.04, x1: 80.02, y0: 1, y1: 2 }, offsets, 1e6)).toEqual({ start: '1 ms', duration: '1 ms', lowerEdge: '-120 kHz', upperEdge: '80 kHz' });
  });

  it('answers null for a box beyond the data', () => {
    expect(selectionValues({ x0: 2412, x1: 2413, y0: 70, y1: 90 }, axes, 4e6)).toBeNull();
  });
});
