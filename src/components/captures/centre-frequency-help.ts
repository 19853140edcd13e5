/** How a capture's centre frequency (SigMF core:frequency) is read, shown under the field that sets it. */
export const CENTRE_FREQUENCY_HELP =
  'RF that 0 Hz of the sampled band stands for (SigMF core:frequency): for a real capture the RF at 0 Hz, not the middle of the band (an IF sampled after a low-side LO at 2.4013 GHz reads 2.4013 GHz)';
