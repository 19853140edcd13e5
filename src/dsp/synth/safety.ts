/**
 * Caution shown wherever a synthesized waveform is exported in a form someone could play through a
 * transmitter or signal generator.
 */

/** Plain-text caution for playback exports of synthesized captures. */
export const TRANSMIT_CAUTION =
  'Playback caution: this waveform was synthesized for analysis. Do not radiate it without the ' +
  'licence or authorisation your local spectrum rules require for that frequency, power and ' +
  'modulation. Run bench tests over a cable into a shielded enclosure or a dummy load, with enough ' +
  'attenuation to protect the receiver.';
