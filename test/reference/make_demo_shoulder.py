#!/usr/bin/env python3
"""The demo's shoulder split from its main peak by perpendicular drop, on the
noiseless curves: what that split gives by construction, for
test/core/measure/peak-demo.test.ts (issue 14).

Reads the two peaks from public/demo/demo-truth.json (written by
scripts/make-demo.mjs: Gaussians of given height, centre and sigma on a drift
that perpendicular drop takes as the baseline). The valley is the lowest
point of their sum between the two centres (scipy.optimize.minimize_scalar,
bounded); each peak's drop-line area is the area of the sum on its side of
the valley (scipy.stats.norm), against its own true area. No other demo peak
comes within 10 of its sigmas of the pair.

Writes test/reference/demo-shoulder.json with the SciPy and NumPy versions.
Run:  python3 test/reference/make_demo_shoulder.py
"""
import json
import math
import pathlib

import numpy as np
import scipy
from scipy import optimize, stats

HERE = pathlib.Path(__file__).resolve().parent
truth = json.loads((HERE.parent.parent / "public" / "demo" / "demo-truth.json").read_text())
peaks = {p["label"]: p for p in truth["peaks"]}
main, sh = peaks["main peak carrying the shoulder"], peaks["shoulder"]


def g(p, t):
    return p["height"] * math.exp(-0.5 * ((t - p["centre"]) / p["sigma"]) ** 2)


def area(p):
    return p["height"] * p["sigma"] * math.sqrt(2 * math.pi)


res = optimize.minimize_scalar(lambda t: g(main, t) + g(sh, t), bounds=(main["centre"], sh["centre"]), method="bounded",
                               options={"xatol": 1e-10})
v = float(res.x)
left = lambda p: area(p) * stats.norm.cdf((v - p["centre"]) / p["sigma"])
right = lambda p: area(p) * stats.norm.sf((v - p["centre"]) / p["sigma"])
shoulder_drop = right(sh) + right(main)
main_drop = left(main) + left(sh)
out = {
    "scipy": scipy.__version__, "numpy": np.__version__,
    "source": "public/demo/demo-truth.json (scripts/make-demo.mjs)",
    "valley_x": v,
    "valley_level_over_shoulder_height": (g(main, v) + g(sh, v)) / (g(main, sh["centre"]) + g(sh, sh["centre"])),
    "resolution": (sh["centre"] - main["centre"]) / (2 * (main["sigma"] + sh["sigma"])),
    "shoulder_true_area": area(sh),
    "shoulder_drop_area": shoulder_drop,
    "shoulder_drop_relative_error": shoulder_drop / area(sh) - 1,
    "shoulder_own_share_lost_left_of_valley": left(sh) / area(sh),
    "main_tail_gained_right_of_valley_over_shoulder_area": right(main) / area(sh),
    "main_drop_relative_error": main_drop / area(main) - 1,
}
(HERE / "demo-shoulder.json").write_text(json.dumps(out, indent=1) + "\n")
print(json.dumps(out, indent=1))
