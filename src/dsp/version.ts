/**
 * Version of the DSP engine. Part of the run cache key (chain revision hash, capture sha256,
 * engine version): bump it whenever any stage can produce different samples or readouts for the
 * same chain and capture, so that cached results are not reused across such a change.
 */
export const ENGINE_VERSION = '1.0.0';
