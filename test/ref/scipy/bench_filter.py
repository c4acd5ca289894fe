"""scipy side of test/bench/filter.bench.ts: times scipy.signal.sosfilt and sosfiltfilt on the same
samples and sections as the JavaScript side, one run per command so the two sides can alternate.

  python3 bench_filter.py DATA.f64 SOS.f64
Reads float64 little-endian samples and sections (6 per section), prints "ready", then answers one
line per command on stdin:
  causal | zerophase      -> "WALL CPU": seconds of one call by time.perf_counter and by
                             time.process_time (this process's CPU time), result kept
  causal_inplace          -> "WALL CPU" of scipy's own filtering loop alone on a copy of the samples
                             made beforehand (scipy.signal._sosfilt._sosfilt, which sosfilt calls
                             after copying its input; a private function): no allocation, as the
                             JavaScript side filtering into a reused output
  causal_pieces N         -> "WALL CPU" of filtering the samples in pieces of N, causal with the
                             state carried from piece to piece (sosfilt with zi), each piece's
                             output a new array dropped before the next (as a streaming caller)
  zerophase_pieces N      -> the same with sosfiltfilt on each piece on its own
  compare_pieces N CAUSAL ZERO -> as compare, against the piecewise results (computed untimed)
  compare CAUSAL ZERO     -> JSON {"causal": d1, "zerophase": d2}: max |js - scipy| / max |scipy|
                             against the JavaScript outputs in those float64 files
  hugepages on|off        -> "ok": numpy's own switch for asking the kernel for huge pages for
                             its large arrays (madvise MADV_HUGEPAGE; numpy's default is on), so
                             a new output array can be timed on the same terms as a JavaScript one
  versions                -> JSON {"scipy": ..., "numpy": ...}
  quit
"""
import json
import sys
import time

import numpy as np
import scipy
from scipy import signal


def main():
    x = np.fromfile(sys.argv[1], dtype="<f8")
    sos = np.fromfile(sys.argv[2], dtype="<f8").reshape(-1, 6)
    last = {}
    print("ready", flush=True)
    for line in sys.stdin:
        cmd = line.split()
        if not cmd:
            continue
        if cmd[0] in ("causal", "zerophase"):
            f = signal.sosfilt if cmd[0] == "causal" else signal.sosfiltfilt
            last[cmd[0]] = None
            c = time.process_time()
            t = time.perf_counter()
            y = f(sos, x)
            dt = time.perf_counter() - t
            dc = time.process_time() - c
            last[cmd[0]] = y
            print(f"{dt!r} {dc!r}", flush=True)
        elif cmd[0] == "causal_inplace":
            from scipy.signal import _sosfilt
            z = np.array(x, copy=True).reshape(1, -1)
            zi = np.zeros((1, sos.shape[0], 2))
            c = time.process_time()
            t = time.perf_counter()
            _sosfilt._sosfilt(sos, z, zi)
            dt = time.perf_counter() - t
            dc = time.process_time() - c
            print(f"{dt!r} {dc!r}", flush=True)
        elif cmd[0] in ("causal_pieces", "zerophase_pieces"):
            n = int(cmd[1])
            c = time.process_time()
            t = time.perf_counter()
            if cmd[0] == "causal_pieces":
                zi = np.zeros((sos.shape[0], 2))
                for a in range(0, len(x), n):
                    y, zi = signal.sosfilt(sos, x[a:a + n], zi=zi)
            else:
                for a in range(0, len(x), n):
                    y = signal.sosfiltfilt(sos, x[a:a + n])
            dt = time.perf_counter() - t
            dc = time.process_time() - c
            print(f"{dt!r} {dc!r}", flush=True)
        elif cmd[0] == "compare_pieces":
            n = int(cmd[1])
            zi = np.zeros((sos.shape[0], 2))
            causal = []
            zero = []
            for a in range(0, len(x), n):
                y, zi = signal.sosfilt(sos, x[a:a + n], zi=zi)
                causal.append(y)
                zero.append(signal.sosfiltfilt(sos, x[a:a + n]))
            out = {}
            for name, path, ref in (("causal", cmd[2], np.concatenate(causal)), ("zerophase", cmd[3], np.concatenate(zero))):
                js = np.fromfile(path, dtype="<f8")
                out[name] = float(np.max(np.abs(js - ref)) / np.max(np.abs(ref)))
            print(json.dumps(out), flush=True)
        elif cmd[0] == "compare":
            out = {}
            for name, path in (("causal", cmd[1]), ("zerophase", cmd[2])):
                js = np.fromfile(path, dtype="<f8")
                ref = last[name]
                out[name] = float(np.max(np.abs(js - ref)) / np.max(np.abs(ref)))
            print(json.dumps(out), flush=True)
        elif cmd[0] == "hugepages":
            core = getattr(np, "_core", None) or np.core
            core.multiarray._set_madvise_hugepage(cmd[1] == "on")
            print("ok", flush=True)
        elif cmd[0] == "versions":
            print(json.dumps({"scipy": scipy.__version__, "numpy": np.__version__}), flush=True)
        elif cmd[0] == "quit":
            break


if __name__ == "__main__":
    main()
