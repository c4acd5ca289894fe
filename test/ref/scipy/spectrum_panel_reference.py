"""Reference values from numpy / scipy for the spectrum panel (renderer/spectrum).

Reads one JSON request from stdin, {"cases": [...]}, and writes one JSON list of results to stdout,
one per case (null when the span holds fewer than 2 samples of any piece).

Case: {"op": "span_spectrum", "span": [start, end] (µs), "pieces": [{"start": µs, "rate": Hz,
"samples": [...]}...]}. The samples of a piece are at start + round(i * 1e6 / rate) µs; those with
start <= t < end are kept, from the piece with most of them (the first of equals); their values are
taken as float32 (as the desk's data workers send them). Result: {"n", "N", "start" (µs of the
first sample kept), "frequencies", "amplitudes", "peak"}, where
  amplitudes = c * |numpy.fft.rfft((x - mean(x)) * w, n=N)| / sum(w),
  w = scipy.signal.get_window("hann", n, fftbins=True) (periodic), N the next power of two >= n
  (at least 2), c = 2 except 1 at 0 Hz and at N/2; frequencies = numpy.fft.rfftfreq(N, 1 / rate);
  peak = the frequency of the largest amplitude above 0 Hz (numpy.argmax).
"""
import json
import sys

import numpy as np
from scipy import signal


def span_spectrum(case):
    best = None
    for p in case["pieces"]:
        x = np.asarray(p["samples"], dtype=np.float32).astype(np.float64)
        t = p["start"] + np.round(np.arange(len(x)) * 1e6 / p["rate"])
        keep = (t >= case["span"][0]) & (t < case["span"][1])
        sel = x[keep]
        if len(sel) >= 2 and (best is None or len(sel) > len(best[0])):
            best = (sel, p["rate"], float(t[keep][0]))
    if best is None:
        return None
    x, rate, t0 = best
    n = len(x)
    N = 2
    while N < n:
        N *= 2
    w = signal.get_window("hann", n, fftbins=True)
    a = np.abs(np.fft.rfft((x - x.mean()) * w, n=N)) / w.sum()
    a[1:-1] *= 2
    f = np.fft.rfftfreq(N, 1.0 / rate)
    k = 1 + int(np.argmax(a[1:]))
    return {"n": n, "N": N, "start": t0, "amplitudes": a.tolist(), "frequencies": f.tolist(), "peak": float(f[k])}


def main():
    request = json.load(sys.stdin)
    json.dump([span_spectrum(c) for c in request["cases"]], sys.stdout)


if __name__ == "__main__":
    main()
