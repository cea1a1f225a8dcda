#!/usr/bin/env python3
"""Reference values for test/core/steps and test/core/numeric (running median, Hampel, Whittaker,
AsLS, arPLS, polynomial baseline, runs test).

Run from the repository root:  python3 test/reference/make_baseline.py
Writes test/reference/baseline.json with the SciPy and NumPy versions used.
Every input is invented by seeded code here and stored in the JSON, so the
TypeScript tests read exactly the same numbers.
"""
import json
import pathlib
import sys

import numpy as np
import scipy
from scipy import ndimage, optimize, signal, sparse, stats
from scipy.sparse.linalg import spsolve

OUT = pathlib.Path(__file__).with_name("baseline.json")
rng = np.random.default_rng(20261202)


def tolist(a):
    return [float(v) for v in np.asarray(a, dtype=float)]


def penalty(n, d=2):
    D = sparse.diags_array([1.0, -2.0, 1.0], offsets=[0, 1, 2], shape=(n - 2, n)) if d == 2 else None
    return (D.T @ D).tocsc()


def whittaker_sparse(y, lam, w):
    n = len(y)
    A = sparse.diags_array(w, offsets=0, shape=(n, n)).tocsc() + lam * penalty(n)
    return spsolve(A.tocsc(), w * y)


def asls_sparse(y, lam, p, max_iter):
    """Eilers & Boelens 2005: weight p above the fit, 1 - p on or below; stop when weights repeat."""
    w = np.ones(len(y))
    for it in range(1, max_iter + 1):
        z = whittaker_sparse(y, lam, w)
        w_new = np.where(y > z, p, 1 - p)
        if np.array_equal(w_new, w):
            return z, it, True
        w = w_new
    return z, max_iter, False


def arpls_sparse(y, lam, max_iter, tol=1e-3):
    """Baek et al. 2015 rule as in REFERENCES.md; population SD of the negative residuals."""
    w = np.ones(len(y))
    for it in range(1, max_iter + 1):
        z = whittaker_sparse(y, lam, w)
        d = y - z
        dn = d[d < 0]
        m, s = dn.mean(), dn.std()
        with np.errstate(over="ignore"):
            wt = 1.0 / (1.0 + np.exp(2.0 * (d - (2.0 * s - m)) / s))
        done = np.linalg.norm(w - wt) / np.linalg.norm(w) < tol
        w = wt
        if done:
            return z, it, True
    return z, max_iter, False


def hampel_loop(y, k, t):
    """Plain loop: window cut at the ends, sigma = 1.4826 * MAD, replace when |y - med| > t * sigma."""
    n = len(y)
    out = y.copy()
    idx = []
    for i in range(n):
        win = y[max(0, i - k): min(n, i + k + 1)]
        med = np.median(win)
        sig = 1.4826 * np.median(np.abs(win - med))
        if abs(y[i] - med) > t * sig:
            out[i] = med
            idx.append(i)
    return out, idx


ref = {
    "generator": "test/reference/make_baseline.py",
    "python": sys.version.split()[0],
    "scipy": scipy.__version__,
    "numpy": np.__version__,
}

# --- running median: scipy.ndimage.median_filter -----------------------------
n = 200
i = np.arange(n)
y_med = np.sin(i / 15.0) + 0.3 * rng.standard_normal(n)
y_med[[0, 17, 18, 90, 199]] += [4.0, -5.0, 3.0, 6.0, -4.0]
y_short = rng.standard_normal(10)
median_cases = []
for name, y in (("signal", y_med), ("short", y_short)):
    for size in (3, 5, 25):
        for mode in ("reflect", "mirror", "nearest", "constant"):
            median_cases.append({
                "input": name, "window": size, "mode": mode,
                "output": tolist(ndimage.median_filter(y, size=size, mode=mode, cval=0.0)),
            })
ref["median"] = {"signal": tolist(y_med), "short": tolist(y_short), "cases": median_cases}
# Window cut at the ends (no padding): plain loop with numpy.median.
ref["medianShrink"] = {
    str(size): tolist([np.median(y_med[max(0, j - size // 2): j + size // 2 + 1]) for j in range(len(y_med))])
    for size in (7, 25)
}
# REFERENCES.md rows: 3-point median of [4, 5, 6].
small = np.array([4.0, 5.0, 6.0])
ref["median456"] = {
    "medfilt_zero": tolist(signal.medfilt(small, 3)),
    "constant": tolist(ndimage.median_filter(small, 3, mode="constant")),
    "reflect": tolist(ndimage.median_filter(small, 3, mode="reflect")),
    "mirror": tolist(ndimage.median_filter(small, 3, mode="mirror")),
}

# --- Hampel (independent plain-loop implementation, NumPy medians) --------------
h_out, h_idx = hampel_loop(y_med, 3, 3.0)
ref["hampel"] = {"k": 3, "t": 3.0, "output": tolist(h_out), "replaced": [int(v) for v in h_idx]}

# --- Whittaker, W = I, lambda = 1e5, 1000 points -------------------------------
n = 1000
i = np.arange(n)
y_wh = np.sin(i / 80.0) + 0.001 * i + 0.2 * rng.standard_normal(n)
ref["whittaker"] = {
    "lambda": 1e5, "y": tolist(y_wh),
    "z": tolist(whittaker_sparse(y_wh, 1e5, np.ones(n))),
}
# Weighted: random 0/1 weights with a few zeros, lambda = 1e3.
w_wh = (rng.random(n) > 0.2).astype(float)
ref["whittakerWeighted"] = {
    "lambda": 1e3, "w": tolist(w_wh),
    "z": tolist(whittaker_sparse(y_wh, 1e3, w_wh)),
}

# --- Whittaker at scale: n = 1e6, lambda = 1e9; input is a formula (no noise) ---
n = 1_000_000
i = np.arange(n, dtype=float)
y_big = 1.0 + 2e-6 * i + np.sin(2 * np.pi * i / 2e5) + np.exp(-0.5 * ((i - 3e5) / 5e3) ** 2)
z_big = whittaker_sparse(y_big, 1e9, np.ones(n))
ref["whittakerLarge"] = {
    "n": n, "lambda": 1e9, "formula": "1 + 2e-6 i + sin(2 pi i / 2e5) + exp(-0.5 ((i - 3e5) / 5e3)^2)",
    "every": 1000, "z": tolist(z_big[::1000]),
}

# --- AsLS and arPLS on a Gaussian peak on a sloped line --------------------------
n = 1000
i = np.arange(n, dtype=float)
line = 0.5 + 0.002 * i
peaks = 3.0 * np.exp(-0.5 * ((i - 400) / 15.0) ** 2) + 2.0 * np.exp(-0.5 * ((i - 700) / 25.0) ** 2)
y_bl = line + peaks + 0.05 * rng.standard_normal(n)
z_asls, it_asls, conv_asls = asls_sparse(y_bl, 1e5, 0.01, 30)
z_ar, it_ar, conv_ar = arpls_sparse(y_bl, 1e5, 50)
ref["asls"] = {"lambda": 1e5, "p": 0.01, "maxIter": 30, "y": tolist(y_bl), "z": tolist(z_asls),
               "iterations": it_asls, "converged": bool(conv_asls)}
ref["arpls"] = {"lambda": 1e5, "maxIter": 50, "tol": 1e-3, "z": tolist(z_ar),
                "iterations": it_ar, "converged": bool(conv_ar)}

# Asymmetric least squares with weight p above estimates the p-expectile (Newey & Powell 1987,
# Econometrica 55:819). For N(0, 1) noise it solves p·E[(X − e)+] = (1 − p)·E[(e − X)+].
def expectile(p):
    f = lambda e: p * (stats.norm.pdf(e) - e * stats.norm.sf(e)) - (1 - p) * (stats.norm.pdf(e) + e * stats.norm.cdf(e))
    return float(optimize.brentq(f, -6, 6, xtol=1e-14))


ref["expectile"] = {str(p): expectile(p) for p in (0.001, 0.01, 0.1)}

# --- polynomial baseline on uneven x: numpy.polynomial.polynomial.polyfit --------
n = 300
x_p = np.cumsum(0.5 + rng.random(n))
y_p = 2.0 - 0.01 * x_p + 3e-5 * x_p ** 2 + 0.02 * rng.standard_normal(n)
y_p += 1.5 * np.exp(-0.5 * ((x_p - x_p[150]) / 5.0) ** 2)
ranges = [[float(x_p[5]), float(x_p[80])], [float(x_p[260]), float(x_p[220])]]
sel = np.zeros(n, dtype=bool)
for a, b in ranges:
    sel |= (x_p >= min(a, b)) & (x_p <= max(a, b))
coef = np.polynomial.polynomial.polyfit(x_p[sel], y_p[sel], 3)
ref["polynomial"] = {"x": tolist(x_p), "y": tolist(y_p), "ranges": ranges, "order": 3,
                     "baseline": tolist(np.polynomial.polynomial.polyval(x_p, coef))}

# --- runs test about the median: counted here, p from scipy.stats.norm ------------
e = rng.standard_normal(301)
e[100:140] += 1.0  # a block pushed up: fewer runs than chance
med = np.median(e)
s = np.sign(e - med)
s = s[s != 0]
n1, n2 = int((s > 0).sum()), int((s < 0).sum())
runs = int(1 + np.count_nonzero(s[1:] != s[:-1]))
N = n1 + n2
mu = 2 * n1 * n2 / N + 1
var = 2 * n1 * n2 * (2 * n1 * n2 - N) / (N ** 2 * (N - 1))
z = (runs - mu) / np.sqrt(var)
c = e - e.mean()
ref["runs"] = {"e": tolist(e), "runs": runs, "expected": mu, "z": z, "p": float(2 * stats.norm.sf(abs(z))),
               "lag1": float(np.sum(c[:-1] * c[1:]) / np.sum(c * c))}

ref["twoSidedP"] = {"z": [0.0, 0.5, 1.0, 1.96, 3.0, 5.0],
                    "p": [float(2 * stats.norm.sf(v)) for v in (0.0, 0.5, 1.0, 1.96, 3.0, 5.0)]}

OUT.write_text(json.dumps(ref, separators=(",", ":")) + "\n")
print(f"wrote {OUT} (SciPy {scipy.__version__}, NumPy {np.__version__})")
