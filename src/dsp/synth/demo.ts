/**
 * Synthesized captures of the invented demo scenario: Saltmarsh Telemetry bringing up a 2.4 GHz
 * direct-conversion receiver for a field sensor network. Every number here (the 2.412 GHz band
 * centre, the beacon, the interferer, the impairments, the seeds) is invented for the demo. Seeds
 * are fixed so first start always creates the same bytes; durations keep each capture at a few MB.
 */
import type { SynthSpecInput } from './validate';

/** One demo capture: what the capture list shows, and the spec that makes its samples. */
export interface DemoSynthCapture {
  /** Stable key for the demo seed (idempotent first start). */
  slug: string;
  name: string;
  description: string;
  tags: string[];
  spec: SynthSpecInput;
  /** SigMF annotation objects marking what the capture holds (absolute RF edges, Hz). */
  annotations: Record<string, unknown>[];
}

/** Band centre of the invented sensor network (Hz). */
const BAND_CENTRE = 2.412e9;
/** IF of the real-sampled receiver variant (Hz): low-side LO at BAND_CENTRE - IF. */
const IF_FREQUENCY = 10.7e6;
/** The node beacon sits 600 kHz above the band centre. */
const BEACON_OFFSET = 600e3;
/** A weak CW interferer 1.35 MHz below the band centre. */
const INTERFERER_OFFSET = -1.35e6;

const BEACON_SYMBOL_RATE = 250e3;
const BEACON_ROLL_OFF = 0.35;

const beacon = (frequency: number, level: number) =>
  ({ modulation: 'qpsk', frequency, level, symbolRate: BEACON_SYMBOL_RATE, rollOff: BEACON_ROLL_OFF, span: 12 }) as const;

/**
 * The beacon and the interferer marked over the whole capture, in RF (the same in every variant:
 * the IF variant's centre frequency is its LO). A root-raised-cosine signal occupies
 * symbol rate x (1 + roll-off) (common practice); the CW line is given a 10 kHz box.
 */
function sceneAnnotations(sampleCount: number): Record<string, unknown>[] {
  const beaconHalfWidth = (BEACON_SYMBOL_RATE * (1 + BEACON_ROLL_OFF)) / 2;
  const beaconRf = BAND_CENTRE + BEACON_OFFSET;
  const interfererRf = BAND_CENTRE + INTERFERER_OFFSET;
  return [
    {
      'core:sample_start': 0,
      'core:sample_count': sampleCount,
      'core:freq_lower_edge': beaconRf - beaconHalfWidth,
      'core:freq_upper_edge': beaconRf + beaconHalfWidth,
      'core:label': 'Node beacon',
      'core:comment': 'QPSK, 250 ksym/s, root-raised-cosine roll-off 0.35.',
    },
    {
      'core:sample_start': 0,
      'core:sample_count': sampleCount,
      'core:freq_lower_edge': interfererRf - 5e3,
      'core:freq_upper_edge': interfererRf + 5e3,
      'core:label': 'CW interferer',
      'core:comment': 'Weak unmodulated carrier 1.35 MHz below the band centre, -50 dBFS.',
    },
  ];
}

/** What sets one baseband board apart: its list entry, how it stores I/Q, its impairments and seed. */
interface BasebandBoard extends Omit<DemoSynthCapture, 'spec' | 'annotations'> {
  datatype: SynthSpecInput['datatype'];
  layout: 'complex' | 'real-pair';
  impairments: SynthSpecInput['impairments'];
  seed: number;
}

/** A baseband I/Q capture at 4 Msps around the band centre: every board sees the same beacon, interferer and noise floor. */
function basebandCapture({ datatype, layout, impairments, seed, ...entry }: BasebandBoard): DemoSynthCapture {
  return {
    ...entry,
    annotations: sceneAnnotations(4e6 * 0.25),
    spec: {
      name: entry.name,
      sampleRate: 4e6,
      duration: 0.25,
      datatype,
      layout,
      centerFrequency: BAND_CENTRE,
      tones: [{ frequency: INTERFERER_OFFSET, level: -50, phase: 0 }],
      carriers: [beacon(BEACON_OFFSET, -12)],
      noise: { mode: 'total', level: -47 },
      impairments,
      seed,
    },
  };
}

export const demoSynthSpecs: readonly DemoSynthCapture[] = [
  basebandCapture({
    slug: 'saltmarsh-rev-a-beacon',
    name: 'Saltmarsh rev A: node beacon, bench 1',
    description:
      'Board rev A of the Saltmarsh Telemetry 2.4 GHz direct-conversion receiver, complex I/Q at 4 Msps around 2.412 GHz: ' +
      'QPSK node beacon (250 ksym/s) 600 kHz above the LO and a weak CW interferer at -1.35 MHz. Rev A shows about ' +
      '0.3 dB I/Q gain and 2 deg phase imbalance and a visible DC offset. Synthesized (invented scenario).',
    tags: ['saltmarsh', 'rev-a', 'beacon', 'synthesized'],
    datatype: 'ci16_le',
    layout: 'complex',
    impairments: {
      gainImbalance: 0.3,
      phaseImbalance: 2,
      dcOffsetI: 0.018,
      dcOffsetQ: -0.011,
      frequencyOffset: 1_800,
      adcBits: 12,
      clip: true,
    },
    seed: 2401,
  }),
  basebandCapture({
    slug: 'saltmarsh-rev-b-beacon',
    name: 'Saltmarsh rev B: node beacon, bench 1',
    description:
      'Board rev B, same bench set-up as rev A: complex I/Q at 4 Msps around 2.412 GHz, QPSK beacon at +600 kHz and the ' +
      'weak CW interferer at -1.35 MHz. The I/Q balance and DC offset are mostly fixed (0.03 dB, 0.2 deg). ' +
      'Synthesized (invented scenario).',
    tags: ['saltmarsh', 'rev-b', 'beacon', 'synthesized'],
    datatype: 'ci16_le',
    layout: 'complex',
    impairments: {
      gainImbalance: 0.03,
      phaseImbalance: 0.2,
      dcOffsetI: 0.0009,
      dcOffsetQ: -0.0006,
      frequencyOffset: 600,
      adcBits: 12,
      clip: true,
    },
    seed: 2402,
  }),
  {
    slug: 'saltmarsh-if-10m7',
    name: 'Saltmarsh IF variant: 10.7 MHz real-sampled IF',
    description:
      'Superheterodyne variant of the receiver: the 2.412 GHz band mixed to a 10.7 MHz IF (low-side LO at 2.4013 GHz) ' +
      'and real-sampled at 40 Msps by a 14-bit ADC. Beacon at 11.3 MHz IF, interferer at 9.35 MHz. ' +
      'Synthesized (invented scenario).',
    tags: ['saltmarsh', 'if', 'real', 'synthesized'],
    annotations: sceneAnnotations(40e6 * 0.1),
    spec: {
      name: 'Saltmarsh IF variant: 10.7 MHz real-sampled IF',
      sampleRate: 40e6,
      duration: 0.1,
      datatype: 'ri16_le',
      layout: 'real',
      centerFrequency: BAND_CENTRE - IF_FREQUENCY,
      tones: [{ frequency: IF_FREQUENCY + INTERFERER_OFFSET, level: -50, phase: 0 }],
      carriers: [beacon(IF_FREQUENCY + BEACON_OFFSET, -12)],
      noise: { mode: 'total', level: -58 },
      impairments: { dcOffsetI: 0.002, frequencyOffset: 1_200, adcBits: 14, clip: true },
      seed: 1070,
    },
  },
  basebandCapture({
    slug: 'saltmarsh-dual-adc',
    name: 'Saltmarsh dual-ADC I/Q, prototype board',
    description:
      'Prototype board that samples the I and Q outputs of the quadrature demodulator with two 12-bit ADC channels at ' +
      '4 Msps (stored as two real channels, ri16_le). The channels differ by 0.5 dB in gain and 1.2 deg in phase and ' +
      'carry small DC offsets; combine them with quadrature-combine. Synthesized (invented scenario).',
    tags: ['saltmarsh', 'dual-adc', 'real-pair', 'synthesized'],
    datatype: 'ri16_le',
    layout: 'real-pair',
    impairments: {
      gainImbalance: 0.5,
      phaseImbalance: 1.2,
      dcOffsetI: 0.004,
      dcOffsetQ: -0.006,
      frequencyOffset: 1_000,
      adcBits: 12,
      clip: true,
    },
    seed: 2403,
  }),
];
