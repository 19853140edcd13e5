/**
 * Labels, units and help texts for the synthesizer form, keyed by the field's dot path in the spec
 * (array items share one entry: `tones.frequency` labels the frequency of every tone).
 */
import type { FieldInfo } from '../types';

export const synthFields: Record<string, FieldInfo> = {
  name: { label: 'Name', help: 'Label for the synthesized capture.' },
  sampleRate: { label: 'Sample rate', unit: 'Hz' },
  duration: { label: 'Duration', unit: 's', help: 'Sample count = duration x sample rate, rounded.' },
  datatype: { label: 'Sample format', help: 'SigMF datatype: c... (e.g. cf32_le, ci16_le, cu8) for complex, r... (e.g. ri16_le, rf32_le) for real and two-channel.' },
  layout: { label: 'Channel layout', help: 'complex: I/Q; real: real-sampled IF; real-pair: two real ADC channels (I and Q).' },
  centerFrequency: { label: 'Centre frequency', unit: 'Hz', help: 'RF frequency that 0 Hz of the capture stands for (metadata only).' },
  tones: { label: 'Tones' },
  'tones.frequency': { label: 'Frequency', unit: 'Hz', help: 'Offset from the centre (complex, two-channel) or frequency from 0 Hz (real).' },
  'tones.level': { label: 'Level', unit: 'dBFS', help: 'Complex: 20 log10 of the amplitude. Real: 20 log10 of the peak amplitude (full-scale sine = 0 dBFS).' },
  'tones.phase': { label: 'Phase', unit: 'deg' },
  carriers: { label: 'Modulated carriers' },
  'carriers.modulation': { label: 'Modulation', help: 'BPSK, QPSK or 16-QAM with root-raised-cosine shaping; AM or FM by a tone.' },
  'carriers.frequency': { label: 'Carrier frequency', unit: 'Hz', help: 'Offset from the centre (complex, two-channel) or IF frequency (real).' },
  'carriers.level': { label: 'Level', unit: 'dBFS', help: 'Mean power of the carrier; for AM, of the unmodulated carrier.' },
  'carriers.symbolRate': { label: 'Symbol rate', unit: 'Hz' },
  'carriers.rollOff': { label: 'Roll-off', help: 'Root-raised-cosine excess bandwidth, 0.05 to 1.' },
  'carriers.span': { label: 'Pulse span', unit: 'symbols', help: 'Length of the root-raised-cosine pulse.' },
  'carriers.depth': { label: 'Modulation depth', help: '0 to 1 (1 = 100 %).' },
  'carriers.deviation': { label: 'Peak deviation', unit: 'Hz' },
  'carriers.toneFrequency': { label: 'Modulating tone', unit: 'Hz' },
  noise: { label: 'Noise' },
  'noise.mode': { label: 'Noise', help: 'off, a total level, or an SNR against the strongest tone or carrier.' },
  'noise.level': { label: 'Total noise level', unit: 'dBFS', help: 'Noise power over the whole sampled band (fs complex, fs/2 real).' },
  'noise.snr': { label: 'SNR', unit: 'dB', help: 'Strongest tone or carrier level minus the total noise level over the sampled band.' },
  impairments: { label: 'Impairments' },
  'impairments.gainImbalance': { label: 'I/Q gain imbalance', unit: 'dB', help: 'Gain of I over gain of Q.' },
  'impairments.phaseImbalance': { label: 'I/Q phase imbalance', unit: 'deg', help: 'Phase error of the Q channel.' },
  'impairments.dcOffsetI': { label: 'DC offset I', unit: 'FS', help: 'Fraction of full scale added to I (or to the real channel).' },
  'impairments.dcOffsetQ': { label: 'DC offset Q', unit: 'FS', help: 'Fraction of full scale added to Q.' },
  'impairments.frequencyOffset': { label: 'Frequency offset', unit: 'Hz', help: 'Added to every tone and carrier (LO error).' },
  'impairments.adcBits': { label: 'ADC resolution', unit: 'bits', help: '0 = no quantisation; 2 to 24 bits.' },
  'impairments.clip': { label: 'Clip at full scale' },
  seed: { label: 'Seed', help: 'The same spec and seed always give the same bytes.' },
};
