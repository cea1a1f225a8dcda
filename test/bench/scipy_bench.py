#!/usr/bin/env python3
"""SciPy side of the speed benchmark (test/bench/run.ts starts it).

Usage (run.ts passes these):
    python3 test/bench/scipy_bench.py --job job.json

job.json lists the traces run.ts generated and wrote as raw little-endian
float64 files, so both sides time exactly the same numbers:
    {"runs": 5, "cases": [{"n": 100000, "file": "/tmp/.../y-100000.f64",
                           "sigma": 0.05, "runs": 5, "hampel": true}, ...]}

For each case it times, median of `runs` calls after one untimed call
(time.perf_counter):
  savgol        scipy.signal.savgol_filter(y, 25, 2)           (mode 'interp', SciPy's default)
  moving-mean   scipy.ndimage.uniform_filter1d(y, 25, mode='nearest')
  median        scipy.ndimage.median_filter(y, 25, mode='nearest')
  hampel        NumPy sliding_window_view median and MAD, k = 12, window cut at the
                ends as ours (no SciPy function exists; informative only). Timed
                once above 2e5 points.
  asls          Eilers & Boelens (2005) loop: scipy.sparse diags + spsolve,
                lambda 1e5, p 0.01, at most 10 solves, stopping when the weights
                stop changing (the same rule as our baselineAsls); spsolve's
                defaults (SuperLU, COLAMD ordering). Timed once above 2e5 points.
  asls-banded   the same loop with scipy.linalg.solveh_banded (LAPACK banded
                Cholesky): SciPy's fastest route, informative
  peaks         scipy.signal.find_peaks(y, prominence=2*sigma)
                + peak_widths(y, peaks, rel_height=0.5, prominence_data=...)

and prints one JSON object on stdout: versions, and per case and step the
median time in ms, all run times, and probe values (the output at a few fixed
indices and its sum) so run.ts can check both sides computed the same thing.
"""
import argparse
import json
import statistics
import sys
import time

import numpy as np
import scipy
from scipy import sparse
from scipy.ndimage import median_filter, uniform_filter1d
from scipy.signal import find_peaks, peak_widths, savgol_filter
from scipy.linalg import solveh_banded
from scipy.sparse.linalg import spsolve


def timed(fn, runs, warm=True):
    """Median wall time in ms of `runs` calls after one untimed call (as run.ts does), all times, and the last result."""
    times = []
    out = fn() if warm else None
    for _ in range(runs):
        t0 = time.perf_counter()
        out = fn()
        times.append((time.perf_counter() - t0) * 1000.0)
    return statistics.median(times), times, out


def probes(a):
    """Output at eleven evenly spread indices (ends included) and the total."""
    n = a.size
    idx = [round(k * (n - 1) / 10) for k in range(11)]
    return {"idx": idx, "values": [float(a[i]) for i in idx], "sum": float(np.sum(a))}


def asls(y, lam, p, max_iter):
    """AsLS baseline as in Eilers & Boelens (2005), second differences, sparse direct solve."""
    n = y.size
    d = sparse.diags([1.0, -2.0, 1.0], [0, -1, -2], shape=(n, n - 2))
    penalty = lam * d.dot(d.transpose())
    w = np.ones(n)
    z = y
    it = 0
    for it in range(1, max_iter + 1):
        weights = sparse.spdiags(w, 0, n, n)
        z = spsolve((weights + penalty).tocsc(), w * y)
        w_new = np.where(y > z, p, 1.0 - p)
        if np.array_equal(w_new, w):
            break
        w = w_new
    return z, it


def asls_banded(y, lam, p, max_iter):
    """The same AsLS loop with LAPACK's banded Cholesky (scipy.linalg.solveh_banded), SciPy's fastest route."""
    n = y.size
    ab = np.zeros((3, n))
    # Diagonals of lambda * D'D for second differences, upper form: row 2 main, row 1 first, row 0 second.
    main = np.full(n, 6.0)
    main[[0, -1]] = 1.0
    main[[1, -2]] = 5.0
    first = np.full(n - 1, -4.0)
    first[[0, -1]] = -2.0
    ab[0, 2:] = lam
    ab[1, 1:] = lam * first
    w = np.ones(n)
    z = y
    it = 0
    for it in range(1, max_iter + 1):
        ab[2] = lam * main + w
        z = solveh_banded(ab, w * y, check_finite=False)
        w_new = np.where(y > z, p, 1.0 - p)
        if np.array_equal(w_new, w):
            break
        w = w_new
    return z, it


def hampel(y, k, t, chunk=1 << 16):
    """Hampel test with a window cut at the ends, in chunks so memory stays near chunk*(2k+1)."""
    n = y.size
    out = y.copy()
    win = 2 * k + 1
    # Interior: full windows through sliding_window_view, chunk by chunk.
    for start in range(k, n - k, chunk):
        stop = min(start + chunk, n - k)
        v = np.lib.stride_tricks.sliding_window_view(y[start - k:stop + k], win)
        med = np.median(v, axis=1)
        mad = np.median(np.abs(v - med[:, None]), axis=1)
        sd = 1.4826 * mad
        seg = y[start:stop]
        bad = np.abs(seg - med) > t * sd
        out[start:stop][bad] = med[bad]
    # Ends: the window is cut, one point at a time.
    for i in list(range(min(k, n))) + list(range(max(n - k, k), n)):
        v = y[max(0, i - k):min(n, i + k + 1)]
        med = np.median(v)
        sd = 1.4826 * np.median(np.abs(v - med))
        if abs(y[i] - med) > t * sd:
            out[i] = med
    return out


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("--job", required=True)
    args = ap.parse_args()
    with open(args.job, "r", encoding="utf-8") as f:
        job = json.load(f)

    result = {"scipy": scipy.__version__, "numpy": np.__version__, "python": sys.version.split()[0], "cases": []}
    for case in job["cases"]:
        y = np.fromfile(case["file"], dtype="<f8")
        n = int(case["n"])
        assert y.size == n, f"expected {n} values in {case['file']}, found {y.size}"
        runs = int(case["runs"])
        sigma = float(case["sigma"])
        steps = {}

        ms, times, out = timed(lambda: savgol_filter(y, 25, 2), runs)
        steps["savgol"] = {"ms": ms, "times": times, "probe": probes(out)}

        ms, times, out = timed(lambda: uniform_filter1d(y, 25, mode="nearest"), runs)
        steps["moving-mean"] = {"ms": ms, "times": times, "probe": probes(out)}

        ms, times, out = timed(lambda: median_filter(y, 25, mode="nearest"), runs)
        steps["median"] = {"ms": ms, "times": times, "probe": probes(out)}

        if case.get("hampel", True):
            slow = n > 200000
            ms, times, out = timed(lambda: hampel(y, 12, 3.0), 1 if slow else runs, warm=not slow)
            steps["hampel"] = {"ms": ms, "times": times, "probe": probes(out)}

        # spsolve takes seconds per solve from 10^6 points on, so the sparse loop is timed fewer times there.
        slow = n > 200000
        ms, times, out = timed(lambda: asls(y, 1e5, 0.01, 10), 1 if slow else runs, warm=not slow)
        steps["asls"] = {"ms": ms, "times": times, "probe": probes(out[0]), "iterations": out[1]}

        ms, times, out = timed(lambda: asls_banded(y, 1e5, 0.01, 10), runs)
        steps["asls-banded"] = {"ms": ms, "times": times, "probe": probes(out[0]), "iterations": out[1]}

        def peaks():
            pk, props = find_peaks(y, prominence=2.0 * sigma)
            w = peak_widths(y, pk, rel_height=0.5,
                            prominence_data=(props["prominences"], props["left_bases"], props["right_bases"]))
            return pk, w

        ms, times, out = timed(peaks, runs)
        pk, w = out
        steps["peaks"] = {
            "ms": ms, "times": times, "count": int(pk.size),
            "widthSum": float(np.sum(w[0])), "indexSum": int(np.sum(pk, dtype=np.int64)),
        }
        result["cases"].append({"n": n, "steps": steps})
        print(f"scipy_bench: n={n} done", file=sys.stderr, flush=True)
    json.dump(result, sys.stdout)
    sys.stdout.write("\n")


if __name__ == "__main__":
    main()
