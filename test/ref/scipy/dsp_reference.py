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
  rfft_amplitude x, window                  -> |numpy.fft.rfft(x * w)| with w = get_window(window, len(x))
                                               (periodic), and sum(w)
  buttap      order                         -> poles [[re, im]...] of scipy.signal.buttap
  lp2lp | lp2hp | lp2bp  z, p, k, wo, bw    -> scipy.signal.lp2*_zpk results {"z", "p", "k"}
  bilinear_zpk z, p, k, fs                  -> scipy.signal.bilinear_zpk result {"z", "p", "k"}
  zpk2sos     z, p, k                       -> scipy.signal.zpk2sos(z, p, k) flat (pairing 'nearest')
  solve_ne    h1, h2, az1, az2              -> [north, east] from numpy.linalg.solve of
                                               [[cos az1, sin az1], [cos az2, sin az2]] per sample
  csqrt       values [[re, im]...]          -> numpy.sqrt of each (complex128), as [[re, im]...];
                                               a part may be the string "-0" for a negative zero
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


def cplx(pairs):
    # float() also reads "-0" (JSON numbers cannot carry a negative zero).
    return np.asarray([complex(float(re), float(im)) for re, im in pairs], dtype=complex)


def pairs(values):
    return [[float(v.real), float(v.imag)] for v in np.asarray(values, dtype=complex)]


def zpk_out(z, p, k):
    return {"z": pairs(z), "p": pairs(p), "k": float(np.real(k))}


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
    if op == "rfft_amplitude":
        x = np.asarray(case["x"], dtype=np.float64)
        w = signal.windows.get_window(case["window"], x.shape[0], fftbins=True)
        return {"amplitude": np.abs(np.fft.rfft(x * w)).tolist(), "wsum": float(np.sum(w))}
    if op == "buttap":
        _, p, _ = signal.buttap(case["order"])
        return pairs(p)
    if op in ("lp2lp", "lp2hp", "lp2bp"):
        z, p, k = cplx(case["z"]), cplx(case["p"]), case["k"]
        if op == "lp2lp":
            return zpk_out(*signal.lp2lp_zpk(z, p, k, wo=case["wo"]))
        if op == "lp2hp":
            return zpk_out(*signal.lp2hp_zpk(z, p, k, wo=case["wo"]))
        return zpk_out(*signal.lp2bp_zpk(z, p, k, wo=case["wo"], bw=case["bw"]))
    if op == "bilinear_zpk":
        return zpk_out(*signal.bilinear_zpk(cplx(case["z"]), cplx(case["p"]), case["k"], fs=case["fs"]))
    if op == "zpk2sos":
        return signal.zpk2sos(cplx(case["z"]), cplx(case["p"]), case["k"]).ravel().tolist()
    if op == "solve_ne":
        a1, a2 = np.radians(case["az1"]), np.radians(case["az2"])
        m = np.array([[np.cos(a1), np.sin(a1)], [np.cos(a2), np.sin(a2)]])
        ne = np.linalg.solve(m, np.vstack([np.asarray(case["h1"], float), np.asarray(case["h2"], float)]))
        return [ne[0].tolist(), ne[1].tolist()]
    if op == "csqrt":
        return pairs(np.sqrt(cplx(case["values"])))
    raise ValueError(f"unknown op {op!r}")


def main():
    request = json.load(sys.stdin)
    json.dump([run(c) for c in request["cases"]], sys.stdout)


if __name__ == "__main__":
    main()
