#!/usr/bin/env python3
"""The benchmark's reference down-conversion written with numpy and SciPy.

Same chain as tests/bench/reference-ddc.chain.json: mix by -1.25 MHz, firwin(127, 400 kHz,
Hamming), keep every 8th output (upfirdn down=8, which computes only kept outputs), Welch PSD
(Hann, 4096 points, 50 % overlap, density scaling, two-sided for complex input).

Usage: python3 ddc_scipy.py CAPTURE.cf32 SAMPLE_RATE_HZ
Prints one JSON line: wall seconds (after imports, and with imports), peak RSS (bytes), peak
frequency (Hz) and level (dBFS/Hz, refined by the same parabola on dB values that the engine uses).
"""
import json
import resource
import sys
import time

t_start = time.perf_counter()
import numpy as np  # noqa: E402
from scipy import signal  # noqa: E402

t_imported = time.perf_counter()


def interpolated_peak(freqs, levels):
    """Highest bin refined by a parabola through it and its neighbours (on dB values)."""
    best = int(np.argmax(levels))
    if best == 0 or best == len(levels) - 1:
        return float(freqs[best]), float(levels[best])
    a, b, c = levels[best - 1], levels[best], levels[best + 1]
    curvature = a - 2 * b + c
    if not curvature < 0:
        return float(freqs[best]), float(b)
    delta = 0.5 * (a - c) / curvature
    step = freqs[best + 1] - freqs[best]
    return float(freqs[best] + delta * step), float(b - 0.25 * (a - c) * delta)


def main():
    path, fs = sys.argv[1], float(sys.argv[2])
    x = np.fromfile(path, dtype=np.complex64)
    samples = x.size
    # Phase in cycles, wrapped in float64 so it stays exact over long captures, then a complex64 LO.
    cycles = np.mod(np.arange(samples, dtype=np.float64) * (-1.25e6 / fs), 1.0)
    lo = np.exp(1j * (2 * np.pi * cycles).astype(np.float32))
    del cycles
    mixed = x * lo
    del x, lo
    taps = signal.firwin(127, 400e3, fs=fs)
    y = signal.upfirdn(taps, mixed, up=1, down=8)
    # upfirdn returns the full convolution; keep the outputs a streaming decimator produces
    # (one per 8 input samples, the first at input sample 0).
    y = y[: (mixed.size + 7) // 8]
    del mixed
    f, p = signal.welch(y, fs=fs / 8, window="hann", nperseg=4096, noverlap=2048, detrend=False,
                        return_onesided=False, scaling="density")
    f = np.fft.fftshift(f)
    p = np.fft.fftshift(p)
    levels = 10 * np.log10(np.maximum(p, 1e-30))
    peak_f, peak_l = interpolated_peak(f, levels)
    t_end = time.perf_counter()
    rss_kib = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss  # KiB on Linux
    print(json.dumps({
        "tool": "numpy/scipy",
        "numpy": np.__version__,
        "scipy": __import__("scipy").__version__,
        "samples": int(samples),
        "computeSeconds": t_end - t_imported,
        "seconds": t_end - t_start,
        "peakRssBytes": rss_kib * 1024,
        "peakFrequency": peak_f,
        "peakLevel": peak_l,
        "outputSamples": int(y.size),
    }))


if __name__ == "__main__":
    main()
