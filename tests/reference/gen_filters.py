#!/usr/bin/env python3
"""Reference vectors for Quadrille's filter design and filtering, computed with SciPy.

Run from the repository root:  python3 tests/reference/gen_filters.py
Writes JSON fixtures to tests/reference/fixtures/filters/. Every file records the SciPy and NumPy
versions that produced it, so the TypeScript tests (tests/dsp/filters*.test.ts) need no Python.
Frequencies are in Hz with an explicit sample rate, as the engine takes them.
"""
import json
import os

import numpy as np
import scipy
import scipy.signal as sig

OUT = os.path.join(os.path.dirname(os.path.abspath(__file__)), "fixtures", "filters")
VERSIONS = {"scipy": scipy.__version__, "numpy": np.__version__}


def write(name, cases, note):
    os.makedirs(OUT, exist_ok=True)
    path = os.path.join(OUT, name)
    with open(path, "w") as fh:
        json.dump({"generator": "tests/reference/gen_filters.py", "versions": VERSIONS,
                   "note": note, "cases": cases}, fh, separators=(",", ":"))
        fh.write("\n")
    print(f"wrote {path} ({len(cases)} cases)")


def mag_db(h):
    return (20 * np.log10(np.maximum(np.abs(h), 1e-300))).tolist()


def response_grid(fs, n=64):
    # Include DC but stop short of Nyquist so log-magnitudes stay finite for high-pass designs.
    return np.linspace(0, fs / 2, n, endpoint=False)


def fir_response(taps, fs):
    freqs = response_grid(fs)
    _, h = sig.freqz(taps, 1, worN=freqs, fs=fs)
    return {"frequencies": freqs.tolist(), "magnitudeDb": mag_db(h),
            "phase": np.unwrap(np.angle(h)).tolist()}


def window_arg(name, beta):
    return ("kaiser", beta) if name == "kaiser" else name


# --- firwin: windowed sinc, cut-offs at the -6 dB point, scale=True ---------------------------
def gen_firwin():
    fs = 48000.0
    cases = []
    windows = [("hamming", None), ("hann", None), ("blackman", None),
               ("blackmanharris", None), ("boxcar", None), ("kaiser", 8.6)]
    specs = [
        ("lowpass", {"cutoff": 6000.0}),
        ("highpass", {"cutoff": 9000.0}),
        ("bandpass", {"low": 4000.0, "high": 11000.0}),
        ("bandstop", {"low": 5000.0, "high": 15000.0}),
    ]
    for wname, beta in windows:
        for response, edges in specs:
            for numtaps in (31, 63):
                if response == "lowpass":
                    cutoff, pass_zero = edges["cutoff"], True
                elif response == "highpass":
                    cutoff, pass_zero = edges["cutoff"], False
                elif response == "bandpass":
                    cutoff, pass_zero = [edges["low"], edges["high"]], False
                else:
                    cutoff, pass_zero = [edges["low"], edges["high"]], True
                taps = sig.firwin(numtaps, cutoff, window=window_arg(wname, beta),
                                  pass_zero=pass_zero, fs=fs)
                case = {"response": response, "window": wname, "beta": beta, "numtaps": numtaps,
                        "sampleRate": fs, **edges, "taps": taps.tolist()}
                case.update(fir_response(taps, fs))
                cases.append(case)
    # An even-length low-pass (allowed for low-pass and band-pass only).
    taps = sig.firwin(40, 3000.0, fs=fs)
    cases.append({"response": "lowpass", "window": "hamming", "beta": None, "numtaps": 40,
                  "sampleRate": fs, "cutoff": 3000.0, "taps": taps.tolist(), **fir_response(taps, fs)})
    # The benchmark's low-pass: 127 taps, 400 kHz at 10 Msps.
    taps = sig.firwin(127, 400e3, fs=10e6)
    cases.append({"response": "lowpass", "window": "hamming", "beta": None, "numtaps": 127,
                  "sampleRate": 10e6, "cutoff": 400e3, "taps": taps.tolist(),
                  **fir_response(taps, 10e6)})
    write("firwin.json", cases, "scipy.signal.firwin(numtaps, cutoff, window, pass_zero, fs), scale=True; "
          "freqz at 'frequencies' (Hz), magnitude in dB, phase unwrapped (rad)")


# --- Kaiser: beta, kaiserord length, Kaiser-window designs -----------------------------------
def gen_kaiser():
    cases = []
    for a in (15.0, 21.0, 30.0, 40.0, 50.0, 60.0, 65.0, 80.0, 100.0):
        cases.append({"kind": "beta", "attenuation": a, "beta": float(sig.kaiser_beta(a))})
    fs = 1.0e6
    for a, transition in ((65.0, 0.0375 * fs / 2), (60.0, 20000.0), (40.0, 50000.0),
                          (80.0, 10000.0), (30.0, 100000.0)):
        numtaps, beta = sig.kaiserord(a, transition / (fs / 2))
        cases.append({"kind": "order", "attenuation": a, "transition": transition,
                      "sampleRate": fs, "numtaps": int(numtaps), "beta": float(beta)})
    designs = [
        ("lowpass", {"cutoff": 100000.0}, 60.0, 20000.0),
        ("highpass", {"cutoff": 250000.0}, 50.0, 40000.0),
        ("bandpass", {"low": 100000.0, "high": 200000.0}, 70.0, 25000.0),
        ("bandstop", {"low": 150000.0, "high": 300000.0}, 45.0, 30000.0),
    ]
    for response, edges, a, transition in designs:
        numtaps, beta = sig.kaiserord(a, transition / (fs / 2))
        if response in ("highpass", "bandstop") and numtaps % 2 == 0:
            numtaps += 1  # firwin needs a type I filter for a pass band at Nyquist
        cutoff = edges["cutoff"] if "cutoff" in edges else [edges["low"], edges["high"]]
        pass_zero = response in ("lowpass", "bandstop")
        taps = sig.firwin(numtaps, cutoff, window=("kaiser", beta), pass_zero=pass_zero, fs=fs)
        cases.append({"kind": "design", "response": response, **edges, "attenuation": a,
                      "transition": transition, "sampleRate": fs, "numtaps": int(numtaps),
                      "beta": float(beta), "taps": taps.tolist(), **fir_response(taps, fs)})
    write("kaiser.json", cases, "scipy.signal.kaiser_beta, kaiserord(attenuation, transition/(fs/2)), "
          "firwin(numtaps, cutoff, window=('kaiser', beta)); odd length forced for high-pass/band-stop")


# --- IIR: Butterworth, Chebyshev I, Bessel (norm='phase') as second-order sections ---------------
def sos_response(sos, fs):
    freqs = response_grid(fs)
    _, h = sig.freqz_sos(sos, worN=freqs, fs=fs)
    return {"frequencies": freqs.tolist(), "magnitudeDb": mag_db(h),
            "phase": np.unwrap(np.angle(h)).tolist()}


def gen_iir():
    fs = 10000.0
    cases = []
    for family in ("butterworth", "chebyshev1", "bessel"):
        for response in ("lowpass", "highpass", "bandpass", "bandstop"):
            orders = (1, 2, 3, 4, 5, 6, 8) if response in ("lowpass", "highpass") else (1, 2, 3, 4)
            for order in orders:
                for ripple in ((0.5, 1.0, 3.0) if family == "chebyshev1" else (None,)):
                    if response in ("lowpass", "highpass"):
                        edges = {"cutoff": 1200.0 if response == "lowpass" else 2100.0}
                        wn = edges["cutoff"]
                    else:
                        edges = {"low": 1000.0, "high": 2500.0}
                        wn = [edges["low"], edges["high"]]
                    btype = {"lowpass": "lowpass", "highpass": "highpass",
                             "bandpass": "bandpass", "bandstop": "bandstop"}[response]
                    if family == "butterworth":
                        sos = sig.butter(order, wn, btype=btype, fs=fs, output="sos")
                    elif family == "chebyshev1":
                        sos = sig.cheby1(order, ripple, wn, btype=btype, fs=fs, output="sos")
                    else:
                        sos = sig.bessel(order, wn, btype=btype, fs=fs, output="sos", norm="phase")
                    cases.append({"family": family, "response": response, "order": order,
                                  "ripple": ripple, "sampleRate": fs, **edges,
                                  "sos": sos.tolist(), **sos_response(sos, fs)})
    write("iir.json", cases, "scipy.signal.butter / cheby1 / bessel(norm='phase') with output='sos' "
          "(zpk2sos default pairing 'nearest'); freqz_sos at 'frequencies' (Hz)")


# --- Group delay ----------------------------------------------------------------------------
def gen_group_delay():
    fs = 8000.0
    # Bin centres, so no frequency lands on a zero of a band-pass design (delay undefined there).
    freqs = (np.arange(32) + 0.5) * fs / 64
    cases = []
    rng = np.random.default_rng(7)
    fir = rng.standard_normal(21) * np.hanning(21)  # asymmetric, so the delay is not constant
    _, gd = sig.group_delay((fir, [1.0]), w=freqs, fs=fs)
    cases.append({"kind": "fir", "sampleRate": fs, "taps": fir.tolist(),
                  "frequencies": freqs.tolist(), "groupDelay": gd.tolist()})
    sos = sig.butter(4, 1000.0, fs=fs, output="sos")
    b, a = sig.sos2tf(sos)
    _, gd = sig.group_delay((b, a), w=freqs, fs=fs)
    cases.append({"kind": "sos", "sampleRate": fs, "sos": sos.tolist(),
                  "frequencies": freqs.tolist(), "groupDelay": gd.tolist()})
    sos = sig.cheby1(3, 1.0, [800.0, 1600.0], btype="bandpass", fs=fs, output="sos")
    b, a = sig.sos2tf(sos)
    _, gd = sig.group_delay((b, a), w=freqs, fs=fs)
    cases.append({"kind": "sos", "sampleRate": fs, "sos": sos.tolist(),
                  "frequencies": freqs.tolist(), "groupDelay": gd.tolist()})
    write("group_delay.json", cases, "scipy.signal.group_delay((b, a), w=frequencies, fs) in samples")


# --- Filtering: lfilter, upfirdn decimation, sosfilt ------------------------------------------
def gen_filtering():
    rng = np.random.default_rng(20240611)
    cases = []
    # Streaming FIR (lfilter with zero initial state) on real and complex input.
    taps = sig.firwin(63, 0.2)
    x = rng.standard_normal(700).astype(np.float32)
    y = sig.lfilter(taps, [1.0], x.astype(np.float64))
    cases.append({"kind": "lfilter", "taps": taps.tolist(), "input": x.tolist(), "output": y.tolist()})
    xc = (rng.standard_normal(600) + 1j * rng.standard_normal(600)).astype(np.complex64)
    yc = sig.lfilter(taps, [1.0], xc.astype(np.complex128))
    cases.append({"kind": "lfilter-complex", "taps": taps.tolist(),
                  "inputRe": xc.real.tolist(), "inputIm": xc.imag.tolist(),
                  "outputRe": yc.real.tolist(), "outputIm": yc.imag.tolist()})
    # Polyphase decimation: upfirdn(h, x, down=M) keeps y[0], y[M], ... of the full convolution.
    for numtaps, factor, n in ((127, 8, 1000), (31, 3, 301), (16, 5, 257)):
        taps = sig.firwin(numtaps, 0.8 / factor)
        xc = (rng.standard_normal(n) + 1j * rng.standard_normal(n)).astype(np.complex64)
        yc = sig.upfirdn(taps, xc.astype(np.complex128), up=1, down=factor)
        cases.append({"kind": "upfirdn", "taps": taps.tolist(), "factor": factor,
                      "inputRe": xc.real.tolist(), "inputIm": xc.imag.tolist(),
                      "outputRe": yc.real.tolist(), "outputIm": yc.imag.tolist()})
    xr = rng.standard_normal(500).astype(np.float32)
    taps = sig.firwin(45, 0.22)
    yr = sig.upfirdn(taps, xr.astype(np.float64), up=1, down=4)
    cases.append({"kind": "upfirdn-real", "taps": taps.tolist(), "factor": 4,
                  "input": xr.tolist(), "output": yr.tolist()})
    # Biquad cascades.
    for name, sos in (("butter6", sig.butter(6, 0.15, output="sos")),
                      ("cheby1-5-bp", sig.cheby1(5, 1.0, [0.2, 0.4], btype="bandpass", output="sos")),
                      ("bessel4-hp", sig.bessel(4, 0.3, btype="highpass", output="sos"))):
        x = rng.standard_normal(1500).astype(np.float32)
        y = sig.sosfilt(sos, x.astype(np.float64))
        cases.append({"kind": "sosfilt", "name": name, "sos": sos.tolist(),
                      "input": x.tolist(), "output": y.tolist()})
    write("filtering.json", cases, "scipy.signal.lfilter / upfirdn(h, x, up=1, down=M) / sosfilt on "
          "float32 random input (default_rng(20240611)), computed in float64")


if __name__ == "__main__":
    gen_firwin()
    gen_kaiser()
    gen_iir()
    gen_group_delay()
    gen_filtering()
