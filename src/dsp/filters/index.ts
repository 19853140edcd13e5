/** Filter design, response and streaming filters of the DSP engine. */
export { FILTER_RESPONSES, checkedEdges, edgeAboveNyquist, type BandEdges, type FilterResponse } from './band-edges';
export { DESIGN_WINDOWS, designWindow, type DesignWindow } from './design-windows';
export { windowedSincTaps, MAX_FIR_TAPS, type WindowedSincSpec } from './windowed-sinc';
export { kaiserBeta, kaiserLength, kaiserDesignAttenuation, kaiserTaps, type KaiserSpec, type KaiserDesign } from './kaiser';
export {
  analogPrototype,
  analogMagnitude,
  butterworthPrototype,
  chebyshev1Prototype,
  besselPrototype,
  MAX_IIR_ORDER,
  type IirFamily,
} from './analog-prototypes';
export { designIir, designIirZpk, type IirSpec } from './iir-design';
export { zpkToSos, type SosMatrix } from './zpk-to-sos';
export type { Zpk } from './zpk';
export { isSosStable, sosPoleRadius, sosPoles } from './stability';
export { frequencyResponse, responseGrid, MAGNITUDE_FLOOR_DB, type FilterDesign, type FrequencyResponse } from './response';
export { FirDecimator, FirFilter } from './fir-decimator';
export { BiquadCascade } from './biquad-cascade';
export { filterSchema, filterFields, type FilterParams } from './filter-params';
export { designFilter, filterResponse, filterStopBandEdge, stopBandEdgeFromResponse, STOP_BAND_LEVEL_DB } from './design';
