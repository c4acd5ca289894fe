"""Reference values from scipy.signal / numpy for the tests of core/dsp.

Reads one JSON request from stdin, {"cases": [...]}, and writes one JSON list of results to stdout,
one result per case, so a test file needs a single python process. Floats travel as JSON numbers
(shortest round-trip repr on both sides, so float64 values arrive exactly).

Cases ("op" selects):
  versions                                  -> {"scipy": ..., "numpy": ...}
  butter      order, corners, kind, fs      -> sos as a flat list (scipy.signal.butter(..., output='sos'))
  butter_zpk  order, corners, kind, fs      -> {"z": [[re, im]...], "p": [[re, im]...], "k": k}
  sosfilt     sos, x, zi (optional)         -> {"y": [...], "zf": [...]}
  sosfilt_extended sos, x                   -> y of the same recurrence as sosfilt (zero initial state)
                                               run in numpy.longdouble (x87 80-bit extended on x86-64),
                                               rounded to float64: a more precise reference for
                                               ill-conditioned designs
  sosfiltfilt sos, x, padlen (optional)     -> y
  sosfilt_zi  sos                           -> zi flat
  freqz       sos, freqs, fs                -> magnitudes |H| at freqs (Hz) (scipy.signal.freqz_sos)
  detrend     x, type ('constant'|'linear') -> y (scipy.signal.detrend)
  tukey       n, alpha                      -> window (scipy.signal.windows.tukey, sym=True)
  window      name, n, sym                  -> scipy.signal.windows.get_window(name, n, fftbins=not sym)
"""
import json
import sys

import numpy as np
import scipy
from scipy import signal


def as_sos(flat):
    return np.asarray(flat, dtype=np.float64).reshape(-1, 6)


def corners(c):
    return c if isinstance(c, (int, float)) else list(c)


def run(case):
    op = case["op"]
    if op == "versions":
        return {"scipy": scipy.__version__, "numpy": np.__version__}
    if op == "butter":
        sos = signal.butter(case["order"], corners(case["corners"]), case["kind"], fs=case["fs"], output="sos")
        return sos.ravel().tolist()
    if op == "butter_zpk":
        z, p, k = signal.butter(case["order"], corners(case["corners"]), case["kind"], fs=case["fs"], output="zpk")
        return {"z": [[v.real, v.imag] for v in np.asarray(z, complex)],
                "p": [[v.real, v.imag] for v in np.asarray(p, complex)], "k": float(k)}
    if op == "sosfilt":
        sos = as_sos(case["sos"])
        x = np.asarray(case["x"], dtype=np.float64)
        zi = case.get("zi")
        if zi is None:
            zi = np.zeros((sos.shape[0], 2))
        y, zf = signal.sosfilt(sos, x, zi=np.asarray(zi, dtype=np.float64).reshape(-1, 2))
        return {"y": y.tolist(), "zf": zf.ravel().tolist()}
    if op == "sosfilt_extended":
        ext = np.longdouble
        sos = as_sos(case["sos"]).astype(ext)
        y = np.asarray(case["x"], dtype=np.float64).astype(ext)
        z = np.zeros((sos.shape[0], 2), dtype=ext)
        for i in range(y.shape[0]):
            v = y[i]
            for s in range(sos.shape[0]):
                o = sos[s, 0] * v + z[s, 0]
                z[s, 0] = sos[s, 1] * v - sos[s, 4] * o + z[s, 1]
                z[s, 1] = sos[s, 2] * v - sos[s, 5] * o
                v = o
            y[i] = v
        return y.astype(np.float64).tolist()
    if op == "sosfiltfilt":
        sos = as_sos(case["sos"])
        x = np.asarray(case["x"], dtype=np.float64)
        return signal.sosfiltfilt(sos, x, padlen=case.get("padlen")).tolist()
    if op == "sosfilt_zi":
        return signal.sosfilt_zi(as_sos(case["sos"])).ravel().tolist()
    if op == "freqz":
        _, h = signal.freqz_sos(as_sos(case["sos"]), worN=np.asarray(case["freqs"], dtype=np.float64), fs=case["fs"])
        return np.abs(h).tolist()
    if op == "detrend":
        return signal.detrend(np.asarray(case["x"], dtype=np.float64), type=case["type"]).tolist()
    if op == "tukey":
        return signal.windows.tukey(case["n"], case["alpha"], sym=True).tolist()
    if op == "window":
        return signal.windows.get_window(case["name"], case["n"], fftbins=not case["sym"]).tolist()
    raise ValueError(f"unknown op {op!r}")


def main():
    request = json.load(sys.stdin)
    json.dump([run(c) for c in request["cases"]], sys.stdout)


if __name__ == "__main__":
    main()
