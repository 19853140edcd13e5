/**
 * The measure stage's sine-fit readouts (IEEE Std 1241-2010, 4.1.4): SNR, SINAD, ENOB, THD and the
 * harmonics table, from the last samples of the stream around the tone the spectrum found.
 */
import type { Readout, ReadoutFlag } from '../types';
import type { ToneReading } from '../measure/tone';
import { fitSine, type SineFit } from '../measure/sine-fit';
import { notComputable, readout } from '../measure/readout';

/** What the fit readouts need of the stage (cycles are per sample; rates in Hz). */
export interface FitInputs {
  complex: boolean;
  sampleRate: number;
  fftSize: number;
  harmonics: number;
  fitSamples: Float32Array | null;
}

/** The sine fit of the kept samples around the spectrum's tone. */
export function fitOf(inputs: FitInputs, tone: ToneReading): SineFit | null {
  const x = inputs.fitSamples!;
  const n = inputs.complex ? x.length / 2 : x.length;
  return fitSine(x, {
    cyclesPerSample: tone.frequency / inputs.sampleRate,
    complex: inputs.complex,
    searchHalfWidth: Math.max(1 / inputs.fftSize, 2 / n),
    harmonics: inputs.complex ? 1 : Math.min(inputs.harmonics, 10),
  });
}

/** SNR, SINAD, ENOB and THD readouts (those in `names`) of a sine fit. */
export function fitReadouts(inputs: FitInputs, fit: SineFit | null, names: [string, string][], flags: ReadoutFlag[]): Readout[] {
  if (!fit) return names.map(([name, unit]) => notComputable(name, unit, 'the sine fit found no tone to fit (too few samples, or no signal)'));
  const noNoise = 'the fit leaves no residual at all (a noise-free synthetic tone), so the ratio is unbounded';
  const sinad = 10 * Math.log10(fit.tonePower / fit.noiseAndDistortionPower);
  let harmonicSum = 0;
  for (const h of fit.harmonics) harmonicSum += h.power ?? 0;
  const out: Readout[] = [];
  for (const [name] of names) {
    if (name === 'SNR') out.push(readout('SNR', 10 * Math.log10(fit.tonePower / fit.noisePower), 'dB', { flags, definition: 'snr-sine-fit', reason: noNoise }));
    if (name === 'SINAD') out.push(readout('SINAD', sinad, 'dB', { flags, definition: 'sinad-sine-fit', reason: noNoise }));
    if (name === 'ENOB') out.push(readout('ENOB', (sinad - 1.76) / 6.02, 'bits', { flags, definition: 'enob-ieee1241', reason: noNoise }));
    if (name === 'THD') {
      const reason = inputs.complex ? 'THD is read on real streams only' : harmonicSum > 0 ? undefined : 'no harmonic power was found (or harmonics = 1)';
      out.push(readout('THD', !inputs.complex && harmonicSum > 0 ? 10 * Math.log10(harmonicSum / fit.tonePower) : null, 'dBc', { flags, definition: 'thd-sine-fit', reason }));
    }
  }
  return out;
}

/** Harmonic 2..min(harmonics, 10) levels (dBc) and aliased frequencies (Hz) of a sine fit. */
export function harmonicReadouts(inputs: FitInputs, fit: SineFit | null, flags: ReadoutFlag[]): Readout[] {
  const out: Readout[] = [];
  const top = Math.max(2, Math.min(inputs.harmonics, 10));
  for (let h = 2; h <= top; h++) {
    const entry = fit?.harmonics.find((e) => e.order === h);
    const reason = !fit ? 'the sine fit found no tone to fit' : !entry ? 'not fitted (raise harmonics)' : entry.reason ?? 'no power at this harmonic';
    const value = entry && entry.power !== null && entry.power > 0 ? 10 * Math.log10(entry.power / fit!.tonePower) : null;
    out.push(readout(`Harmonic ${h}`, value, 'dBc', { flags, definition: 'harmonic-sine-fit', reason }));
    out.push(readout(`Harmonic ${h} frequency`, entry ? entry.aliasedCyclesPerSample * inputs.sampleRate : null, 'Hz', { definition: 'harmonic-aliased-frequency', reason }));
  }
  return out;
}
