#!/usr/bin/env python3
"""Reference values for the readout tests: ideal N-bit ADC sine-fit SINAD (numpy least squares).

Run from the repository root: python3 tests/reference/gen_readouts.py
Writes tests/reference/fixtures/readouts/ideal-adc.json with the numpy and SciPy versions. The
quantised samples are rebuilt in the test with the same formula; a tone is fitted at its true
frequency (a three-parameter fit, IEEE Std 1241-2010 section 4.1.4.2) with numpy.linalg.lstsq, so
the engine's four-parameter fit (which finds the frequency itself) is checked against an
independent solver.
"""
import json
import os

import numpy as np
import scipy

OUT = os.path.join(os.path.dirname(os.path.abspath(__file__)), "fixtures", "readouts")
VERSIONS = {"numpy": np.__version__, "scipy": scipy.__version__}
N = 65536
PHASE = 0.3


def quantised(bits, cycles_per_sample):
    """Mid-rise ideal quantiser, full scale +/-1: codes -2^(N-1)..2^(N-1)-1, level (code + 0.5) q."""
    q = 2.0 / 2**bits
    k = np.arange(N)
    v = np.sin(2 * np.pi * cycles_per_sample * k + PHASE)
    codes = np.clip(np.floor(v / q), -(2 ** (bits - 1)), 2 ** (bits - 1) - 1)
    return ((codes + 0.5) * q).astype(np.float32).astype(np.float64)


def sinad(x, f):
    k = np.arange(N)
    a = np.stack([np.cos(2 * np.pi * f * k), np.sin(2 * np.pi * f * k), np.ones(N)], 1)
    c, *_ = np.linalg.lstsq(a, x, rcond=None)
    r = x - a @ c
    return float(10 * np.log10((c[0] ** 2 + c[1] ** 2) / 2 / np.mean(r**2)))


def main():
    cases = []
    # Bin-centred for an 8192-point FFT (513 and 1031 cycles per 8192 samples) and between bins.
    for bits in (8, 12, 16):
        for label, f in (("bin-centred", 513 / 8192), ("bin-centred", 1031 / 8192), ("off-bin", 513.37 / 8192), ("off-bin", 1031.61 / 8192)):
            cases.append({"bits": bits, "placement": label, "cyclesPerSample": f, "sinadDb": sinad(quantised(bits, f), f)})
    os.makedirs(OUT, exist_ok=True)
    payload = {"versions": VERSIONS, "samples": N, "phase": PHASE, "quantiser": "mid-rise, level (floor(v/q) + 0.5) q, codes clipped to -2^(N-1)..2^(N-1)-1", "cases": cases}
    with open(os.path.join(OUT, "ideal-adc.json"), "w") as f:
        json.dump(payload, f, indent=1)
        f.write("\n")


if __name__ == "__main__":
    main()
