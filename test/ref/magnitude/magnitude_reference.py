"""Reference values from scipy.signal / numpy for the tests of core/magnitude.

Reads one JSON request from stdin, {"cases": [...]}, writes one JSON list of results, one per case.
Complex numbers travel as [re, im] pairs.

Cases ("op" selects):
  versions                                   -> {"scipy": ..., "numpy": ...}
  freqs_zpk  zeros, poles, k, freqs, hertz   -> [[re, im], ...]: scipy.signal.freqs_zpk(z, p, k, worN)
             with worN = 2*pi*f (poles/zeros in rad/s) or worN = f (poles/zeros in Hz, hertz true)
  freqz_fir  b, a, freqs, fs                 -> [[re, im], ...]: scipy.signal.freqz(b, a, worN=freqs, fs=fs)
  remove     x, fs, zeros, poles, k, inpower, outpower, prefilt, wl_db, taper, wa (null or
             {"zeros", "poles", "k"}), detrend ("linear" or absent: mean)        -> y: the removal steps of core/magnitude/removeResponse.ts
             written independently with numpy.fft (rfft/irfft) and scipy.signal.windows.tukey
  wa_peak    x, fs, zeros, poles, k, wa, prefilt, wl_db, taper, i0, i1
                                             -> max |y[i0:i1]| of the same removal with the WA response
"""
import json
import sys

import numpy as np
import scipy
from scipy import signal


def cx(pairs):
    return np.array([complex(a, b) for a, b in pairs], dtype=complex)


def pairs(h):
    return [[float(v.real), float(v.imag)] for v in np.atleast_1d(h)]


def cosine_prefilter(f, c):
    f1, f2, f3, f4 = c
    out = np.zeros_like(f)
    rise = (f > f1) & (f < f2)
    out[rise] = 0.5 * (1 - np.cos(np.pi * (f[rise] - f1) / (f2 - f1)))
    out[(f >= f2) & (f <= f3)] = 1.0
    fall = (f > f3) & (f < f4)
    out[fall] = 0.5 * (1 + np.cos(np.pi * (f[fall] - f3) / (f4 - f3)))
    return out


def remove(case):
    x = np.asarray(case["x"], dtype=float)
    n = len(x)
    fs = case["fs"]
    nfft = 1
    while nfft < 2 * n:
        nfft *= 2
    x = signal.detrend(x, type="linear") if case.get("detrend") == "linear" else x - x.mean()
    x = x * signal.windows.tukey(n, 2 * case["taper"])
    X = np.fft.rfft(x, nfft)
    f = np.fft.rfftfreq(nfft, 1 / fs)
    w = 2 * np.pi * f
    _, R = signal.freqs_zpk(cx(case["zeros"]), cx(case["poles"]), case["k"], worN=w)
    R = R * (1j * w) ** (case["inpower"] - case["outpower"]) if case["inpower"] >= case["outpower"] else R
    if case["inpower"] < case["outpower"]:
        with np.errstate(divide="ignore", invalid="ignore"):
            R = np.where(w > 0, R / (1j * w) ** (case["outpower"] - case["inpower"]), 0)
    if case["wl_db"] is not None:
        lev = np.abs(R).max() * 10 ** (-case["wl_db"] / 20)
        a = np.abs(R)
        low = a < lev
        R[low] = np.where(a[low] > 0, R[low] / np.where(a[low] > 0, a[low], 1) * lev, lev)
    G = np.ones_like(f) if case["prefilt"] is None else cosine_prefilter(f, case["prefilt"])
    if case.get("wa"):
        wa = case["wa"]
        _, S = signal.freqs_zpk(cx(wa["zeros"]), cx(wa["poles"]), wa["k"], worN=w)
        G = G * S
    with np.errstate(divide="ignore", invalid="ignore"):
        Y = np.where(R != 0, X * G / np.where(R != 0, R, 1), 0)
    Y[0] = Y[0].real
    Y[-1] = Y[-1].real
    return np.fft.irfft(Y, nfft)[:n]


def run(case):
    op = case["op"]
    if op == "versions":
        return {"scipy": scipy.__version__, "numpy": np.__version__}
    if op == "freqs_zpk":
        f = np.asarray(case["freqs"], dtype=float)
        wor = f if case.get("hertz") else 2 * np.pi * f
        _, h = signal.freqs_zpk(cx(case["zeros"]), cx(case["poles"]), case["k"], worN=wor)
        return pairs(h)
    if op == "freqz_fir":
        _, h = signal.freqz(case["b"], case["a"], worN=np.asarray(case["freqs"], dtype=float), fs=case["fs"])
        return pairs(h)
    if op == "remove":
        return [float(v) for v in remove(case)]
    if op == "wa_peak":
        y = remove(case)
        return float(np.abs(y[case["i0"]:case["i1"]]).max())
    raise ValueError(f"unknown op {op}")


def main():
    req = json.load(sys.stdin)
    json.dump([run(c) for c in req["cases"]], sys.stdout)


if __name__ == "__main__":
    main()
