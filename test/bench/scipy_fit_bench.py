#!/usr/bin/env python3
"""SciPy side of the region-fit benchmark (test/bench/fit.ts starts it).

Usage: python3 test/bench/scipy_fit_bench.py job.json
Times scipy.optimize.curve_fit (method 'lm', default tolerances) on each
case `calls` times after one untimed call (time.perf_counter), with the
same model, data and starting values as ours; prints JSON on stdout.
"""
import json
import sys
import time

import numpy as np
import scipy
from scipy import optimize, special

LN2 = np.log(2.0)


def gaussian(x, c, h, w):
    return h * np.exp(-4 * LN2 * (x - c) ** 2 / w ** 2)


def emg(x, mu, area, s, t):
    # The same stable form as ours (erfcx where z >= 0), vectorised.
    u = (x - mu) / s
    z = (s / t - u) / np.sqrt(2)
    out = np.empty_like(x)
    pos = z >= 0
    out[pos] = np.exp(-0.5 * u[pos] ** 2) * special.erfcx(z[pos]) / (2 * t)
    neg = ~pos
    out[neg] = np.exp(s * s / (2 * t * t) - (x[neg] - mu) / t) * special.erfc(z[neg]) / (2 * t)
    return area * out


SHAPES = {"gaussian": (gaussian, 3), "emg": (emg, 4)}


def main():
    job = json.load(open(sys.argv[1]))
    x = np.asarray(job["x"])
    centre, half = 0.5 * (x[0] + x[-1]), 0.5 * (x[-1] - x[0])
    out = {"scipy": scipy.__version__, "numpy": np.__version__, "cases": []}
    for c in job["cases"]:
        y = np.asarray(c["y"])
        shapes = c["shapes"]

        def f(xx, *p):
            r = p[-2] + p[-1] * (xx - centre) / half
            o = 0
            for s in shapes:
                fn, k = SHAPES[s]
                r = r + fn(xx, *p[o:o + k])
                o += k
            return r

        optimize.curve_fit(f, x, y, p0=c["p0"])
        times = []
        for _ in range(job["calls"]):
            t0 = time.perf_counter()
            optimize.curve_fit(f, x, y, p0=c["p0"])
            times.append((time.perf_counter() - t0) * 1000)
        out["cases"].append({"name": c["name"], "times": times})
    print(json.dumps(out))


main()
