"""Reference values for peak heights and areas, computed with SciPy.

Writes test/reference/peak-shapes.json next to this script:

* exponentially modified Gaussian densities (scipy.stats.exponnorm, shape
  K = tau/sigma, loc, scale) at a few points, so the tests can check their own
  EMG formula (Grushka 1972, Anal. Chem. 44:1733) against SciPy before using it;
* the analytic perpendicular-drop split of two overlapping Gaussians of equal
  sigma: the drop at the lowest point of their sum between the apexes, each
  peak's area to its side of the drop (both peaks' parts counted, as a
  perpendicular drop does) over its own true area, minus 1;
* the count of local maxima standing u sigma above the mean in n independent
  standard normal samples, n * integral_u^inf phi(x) Phi(x)^2 dx.

Run:  python3 test/reference/make_peak_shapes.py
"""
import json
import pathlib

import numpy as np
import scipy
from scipy import integrate, optimize, stats

out = {"scipy": scipy.__version__, "numpy": np.__version__}

emg = []
for K in (0.5, 1.0, 2.0, 3.0):
    for t in (-2.0, -0.5, 0.3, 1.0, 2.0, 4.0, 8.0, 15.0):
        emg.append({"K": K, "t": t, "pdf": float(stats.exponnorm.pdf(t, K))})
out["exponnorm_pdf_loc0_scale1"] = emg

drops = []
for big, small, rs in ((5, 1, 0.8), (5, 1, 1.0), (5, 1, 1.2), (5, 1, 1.5), (1, 1, 1.5), (1, 1, 0.8)):
    d = 4 * rs  # resolution from base widths 4 sigma: Rs = d / (4 sigma), sigma = 1
    total = lambda t: big * stats.norm.pdf(t) + small * stats.norm.pdf(t - d)
    v = optimize.minimize_scalar(total, bounds=(1e-6, d - 1e-6), method="bounded", options={"xatol": 1e-12}).x
    first = (big * stats.norm.cdf(v) + small * stats.norm.cdf(v - d)) / big - 1
    second = (big * stats.norm.sf(v) + small * stats.norm.sf(v - d)) / small - 1
    drops.append({"first_height": big, "second_height": small, "resolution": rs, "valley": float(v),
                  "first_area_error": float(first), "second_area_error": float(second)})
out["perpendicular_drop_gaussians_sigma1"] = drops

for u in (3.0, 5.0, 10.0):
    val, _ = integrate.quad(lambda x: stats.norm.pdf(x) * stats.norm.cdf(x) ** 2, u, np.inf)
    out.setdefault("independent_maxima_above_u_per_point", []).append({"u": u, "rate": float(val)})

path = pathlib.Path(__file__).with_name("peak-shapes.json")
path.write_text(json.dumps(out, indent=1) + "\n")
print("wrote", path)
