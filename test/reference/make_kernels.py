#!/usr/bin/env python3
"""Reference values for the fast kernels (test/core/numeric/kernels-scipy.test.ts):
running medians over long windows and short signals (scipy.ndimage.median_filter,
which SciPy computes with its own double-heap code), and medians of plain arrays
(numpy.median) for the residual tests' median by selection.

Run from the repository root:  python3 test/reference/make_kernels.py
Writes test/reference/kernels.json with the SciPy and NumPy versions used. The
inputs are invented by seeded code here and stored in the JSON. A median picks
one of the window's values (or the padding constant 0), so each output is stored
as the index of an equal input value (-1 for the constant 0): exact and short.
"""
import json
import pathlib

import numpy as np
import scipy
from scipy import ndimage

OUT = pathlib.Path(__file__).with_name("kernels.json")
rng = np.random.default_rng(20261210)


def as_indices(y, out):
    """Index into y of a value equal to each output value; -1 for a 0 that is not in y (constant padding)."""
    first = {}
    for i, v in enumerate(y.tolist()):
        first.setdefault(v, i)
    idx = []
    for v in out.tolist():
        if v in first:
            idx.append(first[v])
        elif v == 0.0:
            idx.append(-1)
        else:
            raise ValueError(f"median output {v!r} is not an input value")
    return idx


# A drifting trace with noise, a block of rounded values (ties), spikes, and a flat stretch.
n = 1200
i = np.arange(n)
long_signal = 0.002 * i + np.sin(i / 40.0) + 0.3 * rng.standard_normal(n)
# + 0.0 turns the -0.0 that rounding gives into +0.0: the two are equal, and a median may pick either.
long_signal[300:500] = np.round(long_signal[300:500] * 2.0) / 2.0 + 0.0
long_signal[700:760] = 1.25
long_signal[[5, 90, 640, 1190]] += [6.0, -7.0, 5.0, -6.0]
short_signal = rng.standard_normal(40)

median_cases = []
for name, y, windows in (("long", long_signal, (7, 25, 63, 127, 129, 255, 1001)), ("short", short_signal, (129, 1001))):
    for size in windows:
        for mode in ("reflect", "mirror", "nearest", "constant"):
            out = ndimage.median_filter(y, size=size, mode=mode, cval=0.0)
            median_cases.append({"input": name, "window": size, "mode": mode, "outputIndex": as_indices(y, out)})

arrays = {
    "odd": rng.standard_normal(1001),
    "even": rng.standard_normal(1000),
    "ties": np.round(rng.standard_normal(999) * 2.0) + 0.0,
    "evenTies": np.round(rng.standard_normal(1000)) + 0.0,
    "three": np.array([3.0, -1.0, 2.0]),
}

ref = {
    "scipy": scipy.__version__,
    "numpy": np.__version__,
    "median": {
        "signals": {"long": long_signal.tolist(), "short": short_signal.tolist()},
        "cases": median_cases,
    },
    "arrayMedian": {k: {"values": v.tolist(), "median": float(np.median(v))} for k, v in arrays.items()},
}
OUT.write_text(json.dumps(ref, separators=(",", ":")) + "\n", encoding="utf-8")
print(f"wrote {OUT} ({OUT.stat().st_size} bytes), SciPy {scipy.__version__}, NumPy {np.__version__}")
