#!/usr/bin/env python3
"""Reference vectors for the spectral tests (windows, FFT, Welch PSD, spectrogram).

Run from the repository root: python3 tests/reference/gen_spectral.py
Writes JSON fixtures to tests/reference/fixtures/spectral/, each recording the numpy and SciPy
versions. Inputs are drawn from a fixed seed and rounded to float32 first, so the engine (which
reads float32 blocks) and SciPy see exactly the same samples.
"""
import json
import os

import numpy as np
import scipy
import scipy.signal as signal

OUT = os.path.join(os.path.dirname(os.path.abspath(__file__)), "fixtures", "spectral")
VERSIONS = {"numpy": np.__version__, "scipy": scipy.__version__}

# Engine window names -> scipy.signal.get_window names.
WINDOWS = {
    "rectangular": "boxcar",
    "hann": "hann",
    "hamming": "hamming",
    "blackman": "blackman",
    "blackman-harris": "blackmanharris",
    "flattop": "flattop",
}


def write(name, payload):
    payload = {"generator": "tests/reference/gen_spectral.py", "versions": VERSIONS, **payload}
    with open(os.path.join(OUT, name), "w") as f:
        json.dump(payload, f, separators=(",", ":"))
    print("wrote", name)


def f32(x):
    return np.asarray(x, dtype=np.float32).astype(np.float64)


def interleave(z):
    out = np.empty(2 * len(z), dtype=np.float64)
    out[0::2] = z.real
    out[1::2] = z.imag
    return out


def test_signals(rng, n, fs):
    t = np.arange(n) / fs
    real = f32(0.7 * np.sin(2 * np.pi * 1234.5 * t) + 0.05 * np.cos(2 * np.pi * 3000 * t) + 0.01 * rng.standard_normal(n) + 0.02)
    z = 0.6 * np.exp(2j * np.pi * -1700.25 * t) + 0.1 * np.exp(2j * np.pi * 2500 * t) + 0.01 * (rng.standard_normal(n) + 1j * rng.standard_normal(n))
    zi = f32(z.real) + 1j * f32(z.imag)
    return real, zi


def gen_windows():
    cases = []
    for length in (16, 17, 64):
        for engine, sp in WINDOWS.items():
            for periodic in (True, False):
                cases.append({"name": engine, "length": length, "periodic": periodic,
                              "values": signal.get_window(sp, length, fftbins=periodic).tolist()})
        for beta in (0.0, 5.0, 8.6, 14.0):
            for periodic in (True, False):
                cases.append({"name": "kaiser", "beta": beta, "length": length, "periodic": periodic,
                              "values": signal.get_window(("kaiser", beta), length, fftbins=periodic).tolist()})
    write("windows.json", {"cases": cases})


def gen_fft(rng):
    cases = []
    for n in (2, 4, 8, 64, 1024):
        z = rng.standard_normal(n) + 1j * rng.standard_normal(n)
        x = rng.standard_normal(n)
        cases.append({"n": n, "complexInput": interleave(z).tolist(), "complexOutput": interleave(np.fft.fft(z)).tolist(),
                      "realInput": x.tolist(), "realOutput": interleave(np.fft.rfft(x)).tolist()})
    write("fft.json", {"cases": cases})


def gen_welch(rng):
    fs = 48000.0
    n = 5000  # not a multiple of any hop: the tail that completes no segment must be ignored
    real, z = test_signals(rng, n, fs)
    nperseg = 256
    cases = []
    for kind, x in (("real", real), ("complex", z)):
        for scaling in ("density", "spectrum"):
            for window in ("hann", "hamming", "blackman", "flattop"):
                for overlap in (0.5, 0.75):
                    noverlap = int(overlap * nperseg)
                    f, p = signal.welch(x, fs=fs, window=WINDOWS[window], nperseg=nperseg, noverlap=noverlap,
                                        detrend=False, scaling=scaling, return_onesided=(kind == "real"), average="mean")
                    if kind == "complex":
                        f = np.fft.fftshift(f)
                        p = np.fft.fftshift(p)
                    cases.append({"input": kind, "scaling": scaling, "window": window, "overlap": overlap,
                                  "fftSize": nperseg, "frequencies": f.tolist(), "power": p.tolist()})
    write("welch.json", {"sampleRate": fs, "real": real.tolist(), "complex": interleave(z).tolist(), "cases": cases})


def gen_spectrogram(rng):
    fs = 8000.0
    n = 2000
    t = np.arange(n) / fs
    # A chirp makes every row different, so row order and timing errors show.
    real = f32(0.5 * signal.chirp(t, 200, t[-1], 3500) + 0.01 * rng.standard_normal(n))
    zc = 0.5 * np.exp(2j * np.pi * (-3000 * t + 0.5 * 6000 / t[-1] * t * t)) + 0.01 * (rng.standard_normal(n) + 1j * rng.standard_normal(n))
    z = f32(zc.real) + 1j * f32(zc.imag)
    nperseg = 128
    cases = []
    for kind, x in (("real", real), ("complex", z)):
        # Two scaling/overlap pairs per input keep the fixture small while covering both of each.
        for scaling, overlap in (("density", 0.5), ("spectrum", 0.75)):
            noverlap = int(overlap * nperseg)
            f, tt, s = signal.spectrogram(x, fs=fs, window="hann", nperseg=nperseg, noverlap=noverlap, detrend=False,
                                          return_onesided=(kind == "real"), scaling=scaling, mode="psd")
            if kind == "complex":
                f = np.fft.fftshift(f)
                s = np.fft.fftshift(s, axes=0)
            cases.append({"input": kind, "scaling": scaling, "window": "hann", "overlap": overlap, "fftSize": nperseg,
                          "frequencies": f.tolist(), "times": tt.tolist(), "power": s.T.tolist()})
    write("spectrogram.json", {"sampleRate": fs, "real": real.tolist(), "complex": interleave(z).tolist(), "cases": cases})


def main():
    os.makedirs(OUT, exist_ok=True)
    rng = np.random.default_rng(20240611)
    gen_windows()
    gen_fft(rng)
    gen_welch(rng)
    gen_spectrogram(rng)


if __name__ == "__main__":
    main()
