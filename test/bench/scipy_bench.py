#!/usr/bin/env python3
"""SciPy side of the speed benchmark: one persistent process that test/bench/run.ts
drives call by call, so our call and SciPy's call alternate on the same machine
under the same load.

Usage (run.ts starts it; nothing to do by hand):
    python3 test/bench/scipy_bench.py --serve

Protocol: one JSON object per line on stdin, one JSON answer per line on stdout.
    {"op": "hello"}                                   -> versions
    {"op": "load", "n": N, "file": "...f64", "sigma": s}
        reads the raw little-endian float64 samples run.ts wrote (the very same
        numbers both sides time)                       -> {"ok": true}
    {"op": "call", "row": ROW, "n": N}               -> {"ms": wall time of one call}
    {"op": "check", "row": ROW, "n": N}              -> what the call computed (probe
        values at eleven fixed indices and the total, or peak count and sums), made
        outside any timing so run.ts can show both sides computed the same thing
    {"op": "quit"}

Rows (the call timed, time.perf_counter around the call only):
  savitzky-golay   scipy.signal.savgol_filter(y, 25, 2)           (mode 'interp', SciPy's default)
  moving-average   scipy.ndimage.uniform_filter1d(y, 25, mode='nearest')
  running-median   scipy.ndimage.median_filter(y, 25, mode='nearest')
                   (informative rows running-median-w7 and -w201: the same with windows 7 and 201)
  asls             the Eilers & Boelens (2005) reweighting loop, lambda 1e5, p 0.01,
                   at most 10 solves, stopping when the weights stop changing (the rule
                   of our baselineAsls), each solve by scipy.linalg.solveh_banded
                   (LAPACK banded Cholesky): SciPy's fastest route for this system
  asls-spsolve     the same loop with scipy.sparse + spsolve (SuperLU, SciPy's defaults);
                   tens of seconds per call at 10^6 points, so only on request
  peaks            scipy.signal.find_peaks(y, prominence=2*sigma)
                   + peak_widths(y, peaks, rel_height=0.5, prominence_data=...)
"""
import argparse
import json
import sys
import time

import numpy as np
import scipy
from scipy import sparse
from scipy.linalg import solveh_banded
from scipy.ndimage import median_filter, uniform_filter1d
from scipy.signal import find_peaks, peak_widths, savgol_filter
from scipy.sparse.linalg import spsolve


def probes(a):
    """Output at eleven evenly spread indices (ends included) and the total."""
    n = a.size
    idx = [round(k * (n - 1) / 10) for k in range(11)]
    return {"idx": idx, "values": [float(a[i]) for i in idx], "sum": float(np.sum(a))}


def asls_spsolve(y, lam, p, max_iter):
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
    """The same AsLS loop with LAPACK's banded Cholesky (scipy.linalg.solveh_banded)."""
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


def peaks(y, sigma):
    pk, props = find_peaks(y, prominence=2.0 * sigma)
    w = peak_widths(y, pk, rel_height=0.5,
                    prominence_data=(props["prominences"], props["left_bases"], props["right_bases"]))
    return pk, w


ROWS = {
    "savitzky-golay": lambda y, s: savgol_filter(y, 25, 2),
    "moving-average": lambda y, s: uniform_filter1d(y, 25, mode="nearest"),
    "running-median": lambda y, s: median_filter(y, 25, mode="nearest"),
    "running-median-w7": lambda y, s: median_filter(y, 7, mode="nearest"),
    "running-median-w201": lambda y, s: median_filter(y, 201, mode="nearest"),
    "asls": lambda y, s: asls_banded(y, 1e5, 0.01, 10),
    "asls-spsolve": lambda y, s: asls_spsolve(y, 1e5, 0.01, 10),
    "peaks": peaks,
}


def check(row, out):
    """What a call computed, in a form run.ts compares with its own."""
    if row == "peaks":
        pk, w = out
        return {"count": int(pk.size), "widthSum": float(np.sum(w[0])), "indexSum": int(np.sum(pk, dtype=np.int64))}
    if row.startswith("asls"):
        return {"probe": probes(out[0]), "iterations": out[1]}
    return {"probe": probes(out)}


def serve():
    traces = {}
    for line in sys.stdin:
        line = line.strip()
        if not line:
            continue
        msg = json.loads(line)
        op = msg.get("op")
        if op == "hello":
            answer = {"scipy": scipy.__version__, "numpy": np.__version__, "python": sys.version.split()[0]}
        elif op == "load":
            y = np.fromfile(msg["file"], dtype="<f8")
            n = int(msg["n"])
            if y.size != n:
                answer = {"error": f"expected {n} values in {msg['file']}, found {y.size}"}
            else:
                traces[n] = (y, float(msg["sigma"]))
                answer = {"ok": True}
        elif op in ("call", "check"):
            y, sigma = traces[int(msg["n"])]
            fn = ROWS[msg["row"]]
            if op == "call":
                t0 = time.perf_counter()
                out = fn(y, sigma)
                ms = (time.perf_counter() - t0) * 1000.0
                del out
                answer = {"ms": ms}
            else:
                answer = check(msg["row"], fn(y, sigma))
        elif op == "quit":
            break
        else:
            answer = {"error": f"unknown op {op!r}"}
        sys.stdout.write(json.dumps(answer) + "\n")
        sys.stdout.flush()


def main():
    ap = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    ap.add_argument("--serve", action="store_true", help="answer run.ts's requests on stdin/stdout")
    args = ap.parse_args()
    if not args.serve:
        ap.error("run through `npm run bench`, which starts this script with --serve")
    serve()


if __name__ == "__main__":
    main()
