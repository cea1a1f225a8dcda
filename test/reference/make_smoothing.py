#!/usr/bin/env python3
"""Reference values for the smoothing and spacing steps, computed with SciPy/NumPy.

Run from the repository root:  python3 test/reference/make_smoothing.py
Writes test/reference/smoothing.json next to this script, with the library
versions. The test signal is invented here (seeded) and stored in the JSON,
so the TypeScript tests filter exactly the same numbers.
"""
import json
import os

import numpy as np
import scipy
from scipy.ndimage import uniform_filter1d
from scipy.signal import savgol_coeffs, savgol_filter
from scipy.stats import f as f_dist

HERE = os.path.dirname(os.path.abspath(__file__))


def signal_under_test():
    """Three Gaussian peaks on a sloping baseline plus seeded white noise, 200 points."""
    rng = np.random.default_rng(20261202)
    i = np.arange(200, dtype=float)
    y = (
        5.0 * np.exp(-0.5 * ((i - 50.0) / 4.0) ** 2)
        + 2.5 * np.exp(-0.5 * ((i - 110.0) / 9.0) ** 2)
        + 1.2 * np.exp(-0.5 * ((i - 160.0) / 2.5) ** 2)
        + 0.3
        + 0.004 * i
    )
    return y + rng.normal(0.0, 0.15, size=i.size)


def exact_savgol_coeffs(window, order, deriv, pos):
    """Least-squares weights in exact rational arithmetic (normal equations solved with Fractions)."""
    from fractions import Fraction
    from math import factorial

    if pos is None:
        pos = window // 2
    xs = [Fraction(k - pos) for k in range(window)]
    m = order + 1
    rows = [[sum(x ** (i + j) for x in xs) for j in range(m)] + [Fraction(int(i == deriv))] for i in range(m)]
    for c in range(m):
        piv = next(r for r in range(c, m) if rows[r][c] != 0)
        rows[c], rows[piv] = rows[piv], rows[c]
        for r in range(m):
            if r != c and rows[r][c] != 0:
                f = rows[r][c] / rows[c][c]
                rows[r] = [a - f * b for a, b in zip(rows[r], rows[c])]
    z = [rows[i][m] / rows[i][i] for i in range(m)]
    return [float(factorial(deriv) * sum(z[j] * x ** j for j in range(m))) for x in xs]


def floats(a):
    return [float(v) for v in np.asarray(a, dtype=float).ravel()]


def main():
    y = signal_under_test()
    delta = 0.5  # x step for the derivative cases

    savgol = []
    for window in (5, 11, 25):
        for order in (2, 4):
            for deriv in (0, 1, 2):
                for mode in ("interp", "mirror", "nearest", "constant", "wrap"):
                    out = savgol_filter(y, window, order, deriv=deriv, delta=delta, mode=mode, cval=0.0)
                    savgol.append(
                        {"window": window, "order": order, "deriv": deriv, "mode": mode, "delta": delta, "y": floats(out)}
                    )

    # Coefficients in dot (correlation) order, as the tests use them: SciPy's, and the
    # exact rational least-squares weights (SciPy's lstsq on raw powers loses about
    # 7 digits at window 101, order 6).
    coeffs = []
    for window, order, deriv, pos in ((101, 6, 0, None), (11, 3, 0, 0), (11, 3, 1, 2), (25, 4, 2, None), (7, 2, 0, 6)):
        c = savgol_coeffs(window, order, deriv=deriv, pos=pos, use="dot")
        exact = exact_savgol_coeffs(window, order, deriv, pos)
        coeffs.append({"window": window, "order": order, "deriv": deriv, "pos": pos, "c": floats(c), "exact": exact})

    uniform = []
    for size in (3, 5, 25):
        for mode in ("reflect", "mirror", "nearest"):
            uniform.append({"size": size, "mode": mode, "y": floats(uniform_filter1d(y, size, mode=mode))})

    fppf = []
    for d1 in (1, 2, 3):
        for d2 in (1, 2, 5, 8, 22, 98, 998):
            for p in (0.5, 0.9, 0.95, 0.99, 0.999):
                fppf.append({"p": p, "d1": d1, "d2": d2, "q": float(f_dist.ppf(p, d1, d2))})
    fcdf = []
    for d1, d2, x in ((1, 8, 0.3), (1, 8, 5.0), (1, 98, 3.9), (3, 22, 2.0), (2, 5, 0.01), (1, 998, 10.0)):
        fcdf.append({"x": x, "d1": d1, "d2": d2, "p": float(f_dist.cdf(x, d1, d2))})

    # Height of a noise-free Gaussian (sigma = 5 points, centred on a sample) after
    # smoothing, relative to the original height.
    k = np.arange(-200, 201, dtype=float)
    g = np.exp(-0.5 * (k / 5.0) ** 2)
    heights = []
    for window in (5, 11, 25):
        for order in (2, 4):
            if order >= window:
                continue
            heights.append({"window": window, "order": order, "ratio": float(savgol_filter(g, window, order)[200])})
    for size in (5, 11):
        heights.append({"window": size, "order": -1, "ratio": float(uniform_filter1d(g, size)[200])})

    # Plain DFT of the test signal (length 200 is not a power of two).
    spec = np.fft.rfft(y)

    out = {
        "source": "test/reference/make_smoothing.py",
        "scipy": scipy.__version__,
        "numpy": np.__version__,
        "signal": floats(y),
        "savgol": savgol,
        "savgolCoeffs": coeffs,
        "uniformFilter1d": uniform,
        "fPpf": fppf,
        "fCdf": fcdf,
        "gaussianHeightRatio": heights,
        "rfftRe": floats(spec.real),
        "rfftIm": floats(spec.imag),
    }
    with open(os.path.join(HERE, "smoothing.json"), "w") as fh:
        json.dump(out, fh, separators=(",", ":"))
        fh.write("\n")


if __name__ == "__main__":
    main()
