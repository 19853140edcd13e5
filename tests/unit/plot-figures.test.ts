/**
 * The shared figure pieces: one rule for a level without a value (null, not finite, or the
 * engine's floor of -300 dB, see LEVEL_FLOOR_DB in src/dsp/spectral/levels.ts), the colour floor
 * taken over present levels only, and channel names by sample type.
 */
import { describe, expect, it } from 'vitest';
import { channelNames, isMissingLevel, minMaxTraces, percentile, plotLevels, spectrogramTrace } from '@/components/plots/figures';
import type { PlotTheme } from '@/components/plots/plot-theme';

const theme: PlotTheme = {
  dark: false,
  ink: 'rgba(0, 0, 0, 1)',
  muted: 'rgba(100, 100, 100, 1)',
  line: 'rgba(200, 200, 200, 1)',
  panel: 'rgba(255, 255, 255, 1)',
  accent: 'rgba(0, 100, 150, 1)',
  danger: 'rgba(200, 0, 0, 1)',
  ok: 'rgba(0, 150, 0, 1)',
  series: ['rgba(0, 100, 150, 1)', 'rgba(200, 80, 0, 1)'],
};
const unitScale = { divisor: 1, unit: 'Hz' };

describe('missing levels', () => {
  it('treats null, NaN, infinities and the -300 dB floor as missing, and real levels as present', () => {
    for (const value of [null, undefined, Number.NaN, -Infinity, Infinity, -300, -350]) expect(isMissingLevel(value)).toBe(true);
    for (const value of [-299.9, -120, 0, 12.5]) expect(isMissingLevel(value)).toBe(false);
  });

  it('turns every missing level into null, the gap Plotly draws', () => {
    expect(plotLevels([-80, -300, Number.NaN, null, -90])).toEqual([-80, null, null, null, -90]);
  });

  it('takes the colour floor over present levels only', () => {
    // Present: -100, -90, -80, -70 (sorted); the 25th percentile is the second of four.
    const rows = [
      [-300, -100, null],
      [-90, Number.NaN, -80, -70],
    ];
    expect(percentile(rows, 0.25)).toBe(-90);
    expect(percentile(rows, 0)).toBe(-100);
    expect(percentile(rows, 1)).toBe(-70);
    expect(percentile([[null, -300]], 0.05)).toBeUndefined();
  });

  it('draws a spectrogram with its missing cells empty and its floor from present cells', () => {
    const trace = spectrogramTrace({ x: [0, 1], y: [0, 1], levels: [[-300, -60], [-50, -40]], unit: 'dBFS', frequencyScale: unitScale, timeScale: { divisor: 1, unit: 's' }, theme }) as {
      z: (number | null)[][];
      zmin: number;
    };
    expect(trace.z).toEqual([[null, -60], [-50, -40]]);
    expect(trace.zmin).toBe(-60);
  });
});

describe('channels', () => {
  it('names the channels by sample type', () => {
    expect(channelNames('complex')).toEqual(['I', 'Q']);
    expect(channelNames('real-pair')).toEqual(['Channel 0 (I)', 'Channel 1 (Q)']);
    expect(channelNames('real')).toEqual(['Signal']);
  });

  it('draws a band (min line, then max filled to it) per channel, or one line when a column is one sample', () => {
    const channels = [{ min: [-1, -2], max: [1, 2] }];
    const band = minMaxTraces({ times: [0, 1], channels, samplesPerColumn: 4, names: ['I'], timeScale: { divisor: 1, unit: 's' }, theme, fillOpacity: 0.2 }) as Record<string, unknown>[];
    expect(band.map((t) => t.y)).toEqual([[-1, -2], [1, 2]]);
    expect(band[1]!.fill).toBe('tonexty');
    expect(band[1]!.fillcolor).toBe('rgba(0, 100, 150, 0.2)');
    const lines = minMaxTraces({ times: [0, 1], channels, samplesPerColumn: 1, names: ['I'], timeScale: { divisor: 1, unit: 's' }, theme, fillOpacity: 0.2 }) as Record<string, unknown>[];
    expect(lines.map((t) => t.y)).toEqual([[1, 2]]);
  });
});
