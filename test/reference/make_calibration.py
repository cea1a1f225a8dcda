#!/usr/bin/env python3
"""Reference values for test/calibration and test/core/numeric/distributions.

Run from the repository root:  python3 test/reference/make_calibration.py
Writes test/reference/calibration.json with the SciPy and NumPy versions used.
Every input is invented here from a seeded NumPy generator and stored in the
JSON, so the TypeScript tests read exactly the numbers the references saw.

What is computed, and by what:
* t and F distribution values: scipy.stats.t / scipy.stats.f, scipy.special.betainc.
* Weighted fits, every case also in exact rational arithmetic (Python fractions),
  and: numpy.polyfit(x, y, deg, w=sqrt(weights), cov=True) for curves
  with an intercept (polyfit weights multiply the residuals, so they are the
  square roots of the least-squares weights; its covariance is scaled by
  chi2/(n - deg - 1) since NumPy 1.23, gh-11196); numpy.linalg.lstsq on the
  weighted design for curves through the origin; scipy.stats.linregress for the
  unweighted straight lines (slope, intercept, their standard errors, r).
  Weights are normalised to sum to n, as in Miller & Miller 2010 §5.10, so the
  residual standard deviation sqrt(sum(w r^2)/(n - p)) is comparable.
* Lack-of-fit F-test (Draper & Smith 1998, Applied Regression Analysis, 3rd ed.,
  §2.1) and the t-test of the quadratic term, p-values with scipy.stats.
* Inverse prediction, written out here from the published formulas:
  - Miller & Miller 2010 (Statistics and Chemometrics for Analytical Chemistry,
    6th ed.) eq. 5.9 (unweighted) and eq. 5.16 (weighted) for s_x0, the
    ISO 8466-1 form;
  - Draper & Smith 1998 §3.2 for Fieller's interval of the straight line
    (closed form with g = t^2 s^2 / (b^2 Sxx));
  - for weighted lines and quadratics, the same inversion of the prediction
    band solved with numpy.roots on the polynomial
    (y0 - f(x))^2 - t^2 s^2 (1/(m w(x)) + phi' (X'WX)^-1 phi);
  - for the quadratic, also the delta-method s_x0 in the sums-of-powers form
    of ISO 8466-2 (from memory), which must equal phi'(X'WX)^-1 phi written
    with the covariance matrix.
"""
import json
import pathlib
from fractions import Fraction

import numpy as np
import scipy
from scipy import special, stats

OUT = pathlib.Path(__file__).with_name("calibration.json")
rng = np.random.default_rng(20261221)


def fl(a):
    return [float(v) for v in np.asarray(a, dtype=float).ravel()]


# ---------------------------------------------------------------- distributions
def distributions():
    t_cases = []
    for df in [1, 2, 3, 4, 5, 7, 10, 13, 30, 100, 1000]:
        for p in [0.6, 0.9, 0.95, 0.975, 0.995, 0.9995, 0.05, 0.001]:
            t_cases.append({"p": p, "df": df, "quantile": float(stats.t.ppf(p, df))})
    t_tails = []
    for df in [1, 2.5, 4, 10, 57]:
        for t in [-3.0, -0.5, 0.0, 0.3, 1.0, 2.0, 4.5, 12.0, 40.0]:
            t_tails.append({"t": t, "df": df, "sf": float(stats.t.sf(t, df)), "cdf": float(stats.t.cdf(t, df))})
    f_tails = []
    for d1, d2 in [(1, 1), (1, 5), (2, 7), (3, 3), (4, 20), (10, 2), (1, 100), (7.5, 11)]:
        for f in [0.0, 0.1, 0.7, 1.0, 2.5, 6.0, 30.0, 400.0]:
            f_tails.append({"f": f, "d1": d1, "d2": d2, "sf": float(stats.f.sf(f, d1, d2)), "cdf": float(stats.f.cdf(f, d1, d2))})
    beta = []
    for a, b in [(0.5, 0.5), (1, 3), (2.5, 0.5), (10, 10), (50, 0.5), (0.5, 400), (200, 300)]:
        for x in [0.001, 0.1, 0.37, 0.5, 0.8, 0.999]:
            beta.append({"x": x, "a": a, "b": b, "value": float(special.betainc(a, b, x))})
    lgamma = [{"x": x, "value": float(special.gammaln(x))} for x in [0.1, 0.5, 1.0, 1.5, 2.0, 3.7, 10.0, 57.5, 500.0, 1e5]]
    return {"tQuantile": t_cases, "tTail": t_tails, "fTail": f_tails, "incompleteBeta": beta, "logGamma": lgamma}


# ---------------------------------------------------------------- fits
def weight_power(weighting):
    return {"none": 0, "1/x": 1, "1/x2": 2}[weighting]


def powers_of(kind, origin):
    top = 1 if kind == "line" else 2
    return list(range(1 if origin else 0, top + 1))


def normalised_weights(x, weighting):
    k = weight_power(weighting)
    raw = np.ones_like(x) if k == 0 else x ** (-k)
    return raw / raw.mean(), raw.mean()


def design(x, powers):
    return np.column_stack([x ** p for p in powers])


def fit(x, y, kind, origin, weighting):
    w, wscale = normalised_weights(x, weighting)
    powers = powers_of(kind, origin)
    n, p = len(x), len(powers)
    if not origin:
        deg = powers[-1]
        coef_desc, cov_desc = np.polyfit(x, y, deg, w=np.sqrt(w), cov=True)
        coef = coef_desc[::-1]
        cov = cov_desc[::-1, ::-1]
        source = "numpy.polyfit(w=sqrt(weights), cov=True)"
    else:
        X = design(x, powers) * np.sqrt(w)[:, None]
        coef, *_ = np.linalg.lstsq(X, y * np.sqrt(w), rcond=None)
        r = y - design(x, powers) @ coef
        s2 = np.sum(w * r ** 2) / (n - p)
        cov = s2 * np.linalg.inv(X.T @ X)
        source = "numpy.linalg.lstsq on the weighted design"
    fitted = design(x, powers) @ coef
    r = y - fitted
    rss = float(np.sum(w * r ** 2))
    s = np.sqrt(rss / (n - p))
    if origin:
        tss = np.sum(w * y ** 2)
    else:
        ybar = np.sum(w * y) / np.sum(w)
        tss = np.sum(w * (y - ybar) ** 2)
    out = {
        "kind": kind, "throughOrigin": origin, "weighting": weighting, "source": source,
        "powers": powers, "coefficients": fl(coef), "standardErrors": fl(np.sqrt(np.diag(cov))),
        "covariance": [fl(row) for row in cov], "residualSd": float(s), "rSquared": float(1 - rss / tss),
        "weightScale": float(wscale), "df": n - p,
    }
    out["exact"] = exact_fit(x, y, powers, weighting)
    if kind == "line" and not origin and weighting == "none":
        lr = stats.linregress(x, y)
        out["linregress"] = {"slope": float(lr.slope), "intercept": float(lr.intercept), "stderr": float(lr.stderr),
                             "interceptStderr": float(lr.intercept_stderr), "rvalue": float(lr.rvalue)}
    return out, coef, cov, w, wscale, s


def exact_fit(x, y, powers, weighting):
    """The same weighted least squares in exact rational arithmetic (Python fractions): the normal
    equations solved by Gauss-Jordan elimination without rounding; square roots taken at the end.
    An oracle independent of any floating-point solver, for cases where polyfit's own rounding
    (raw powers of x far from zero) is larger than the tolerance."""
    xs = [Fraction(float(v)) for v in x]
    ys = [Fraction(float(v)) for v in y]
    k = weight_power(weighting)
    raw = [Fraction(1) if k == 0 else 1 / xi ** k for xi in xs]
    scale = sum(raw) / len(raw)
    w = [r / scale for r in raw]
    p = len(powers)
    X = [[xi ** pw for pw in powers] for xi in xs]
    A = [[sum(w[n] * X[n][i] * X[n][j] for n in range(len(xs))) for j in range(p)] for i in range(p)]
    rhs = [sum(w[n] * X[n][i] * ys[n] for n in range(len(xs))) for i in range(p)]

    def solve(M, b):
        m = [row[:] + [bb] for row, bb in zip(M, b)]
        for i in range(p):
            piv = next(r for r in range(i, p) if m[r][i] != 0)
            m[i], m[piv] = m[piv], m[i]
            for r in range(p):
                if r != i:
                    f = m[r][i] / m[i][i]
                    m[r] = [a - f * bq for a, bq in zip(m[r], m[i])]
        return [m[i][p] / m[i][i] for i in range(p)]

    coef = solve(A, rhs)
    inv = [solve(A, [Fraction(int(i == j)) for i in range(p)]) for j in range(p)]  # columns of A^-1 (symmetric)
    r = [ys[n] - sum(X[n][i] * coef[i] for i in range(p)) for n in range(len(xs))]
    s2 = sum(w[n] * r[n] ** 2 for n in range(len(xs))) / (len(xs) - p)
    return {"coefficients": [float(c) for c in coef], "standardErrors": [float(s2 * inv[i][i]) ** 0.5 for i in range(p)],
            "residualSd": float(s2) ** 0.5}


def lack_of_fit(x, y, w, rss, p):
    levels = np.unique(x)
    ss_pe = 0.0
    for lv in levels:
        m = x == lv
        mean = np.sum(w[m] * y[m]) / np.sum(w[m])
        ss_pe += np.sum(w[m] * (y[m] - mean) ** 2)
    df_pe = len(x) - len(levels)
    df_lof = len(levels) - p
    if df_pe < 1 or df_lof < 1:
        return None
    ss_lof = rss - ss_pe
    F = (ss_lof / df_lof) / (ss_pe / df_pe)
    return {"pureErrorSumOfSquares": float(ss_pe), "pureErrorDf": int(df_pe), "lackOfFitSumOfSquares": float(ss_lof),
            "lackOfFitDf": int(df_lof), "f": float(F), "pValue": float(stats.f.sf(F, df_lof, df_pe))}


def make_case(name, x, y, note):
    x = np.asarray(x, dtype=float)
    y = np.asarray(y, dtype=float)
    fits = []
    for origin in [False, True]:
        for weighting in ["none", "1/x", "1/x2"]:
            if weighting != "none" and np.any(x <= 0):
                continue
            for kind in ["line", "quadratic"]:
                f, coef, cov, w, _, s = fit(x, y, kind, origin, weighting)
                rss = float(np.sum(w * (y - design(x, f["powers"]) @ coef) ** 2))
                f["lackOfFit"] = lack_of_fit(x, y, w, rss, len(f["powers"]))
                if kind == "quadratic":
                    j = f["powers"].index(2)
                    t = coef[j] / np.sqrt(cov[j, j])
                    f["curvature"] = {"t": float(t), "df": f["df"], "pValue": float(2 * stats.t.sf(abs(t), f["df"]))}
                fits.append(f)
    return {"name": name, "note": note, "amounts": fl(x), "responses": fl(y), "fits": fits}


def fit_cases():
    cases = []
    levels = np.array([1.0, 2.0, 5.0, 10.0, 20.0])
    x = np.repeat(levels, 2)
    y = 0.3 + 2.1 * x + rng.normal(0, 0.4, x.size)
    cases.append(make_case("line-duplicates", x, y, "5 levels in duplicate, constant SD 0.4, straight truth"))
    y = 0.05 + 1.7 * x + x * rng.normal(0, 0.03, x.size)
    cases.append(make_case("proportional-sd", x, y, "5 levels in duplicate, SD 3 % of the amount (1/x² is the matching weight)"))
    x = np.array([0.5, 1.0, 2.0, 3.0, 4.0, 6.0, 8.0])
    y = 0.1 + 3.0 * x - 0.12 * x ** 2 + rng.normal(0, 0.05, x.size)
    cases.append(make_case("curved-single", x, y, "7 levels, no replicates, curved truth (quadratic term -0.12)"))
    x = np.repeat(np.array([2.0, 4.0, 6.0, 8.0, 10.0]), 3)
    y = 0.2 + 1.5 * x - 0.02 * x ** 2 + np.sqrt(x) * rng.normal(0, 0.05, x.size)
    cases.append(make_case("curved-triplicates", x, y, "5 levels in triplicate, mild curvature, SD proportional to sqrt(amount)"))
    x = np.array([0.0, 0.0, 1.0, 1.0, 3.0, 3.0, 6.0, 6.0])
    y = 1.2 * x + rng.normal(0, 0.08, x.size)
    cases.append(make_case("with-blank", x, y, "a zero-amount standard: only unweighted fits are possible"))
    x = np.array([1000.0, 1001.0, 1002.0, 1003.0, 1004.0, 1005.0])
    y = -3.0 + 0.02 * x + rng.normal(0, 0.001, x.size)
    cases.append(make_case("far-from-origin", x, y, "amounts far from zero relative to their spread (conditioning)"))
    return cases


# ---------------------------------------------------------------- inverse prediction
def t975(df, level=0.95):
    return float(stats.t.ppf(0.5 + level / 2, df))


def miller_line(x, y, y0, m, level):
    """Miller & Miller 2010 eq. 5.9 (ISO 8466-1): s_x0 and x0 +/- t s_x0; Draper & Smith 1998 §3.2 Fieller interval."""
    n = len(x)
    xbar, ybar = x.mean(), y.mean()
    sxx = np.sum((x - xbar) ** 2)
    b = np.sum((x - xbar) * (y - ybar)) / sxx
    a = ybar - b * xbar
    s = np.sqrt(np.sum((y - a - b * x) ** 2) / (n - 2))
    x0 = (y0 - a) / b
    sx0 = (s / b) * np.sqrt(1 / m + 1 / n + (y0 - ybar) ** 2 / (b ** 2 * sxx))
    t = t975(n - 2, level)
    g = t ** 2 * s ** 2 / (b ** 2 * sxx)
    d = (y0 - ybar) / b
    if g < 1:
        half = (t * s / b) * np.sqrt((y0 - ybar) ** 2 / (b ** 2 * sxx) + (1 - g) * (1 / m + 1 / n))
        fieller = [float(v) for v in sorted([xbar + (d - half) / (1 - g), xbar + (d + half) / (1 - g)])]
    else:
        # Draper & Smith: with g >= 1 the slope is not significant and no finite interval exists.
        fieller = [None, None]
    return {"amount": float(x0), "standardError": float(abs(sx0)), "symmetric": [float(x0 - t * abs(sx0)), float(x0 + t * abs(sx0))],
            "fieller": fieller, "g": float(g), "t": t}


def miller_weighted_line(x, y, weighting, y0, m, level):
    """Miller & Miller 2010 eq. 5.16 with normalised weights, w0 = w(x0) / m; exact interval by numpy.roots."""
    n = len(x)
    w, wscale = normalised_weights(x, weighting)
    xw, yw = np.sum(w * x) / n, np.sum(w * y) / n
    b = (np.sum(w * x * y) - n * xw * yw) / (np.sum(w * x ** 2) - n * xw ** 2)
    a = yw - b * xw
    s = np.sqrt(np.sum(w * (y - a - b * x) ** 2) / (n - 2))
    x0 = (y0 - a) / b
    k = weight_power(weighting)
    w0 = x0 ** (-k) / wscale
    sxxw = np.sum(w * x ** 2) - n * xw ** 2
    sx0 = (s / b) * np.sqrt(1 / (m * w0) + 1 / n + (y0 - yw) ** 2 / (b ** 2 * sxxw))
    t = t975(n - 2, level)
    # Exact inversion: (y0 - a - b x)^2 - t^2 s^2 (wscale x^k / m + 1/n + (x - xw)^2 / sxxw) = 0.
    P = np.polynomial.Polynomial
    g = P([y0 - a, -b])
    var = P([1 / n]) + P([-xw, 1]) ** 2 / sxxw + P([0] * k + [wscale / m])
    h = g ** 2 - t ** 2 * s ** 2 * var
    roots = np.sort(np.real(h.roots()[np.abs(np.imag(h.roots())) < 1e-9]))
    lo = max([r for r in roots if r < x0], default=None)
    hi = min([r for r in roots if r > x0], default=None)
    return {"amount": float(x0), "standardError": float(abs(sx0)), "symmetric": [float(x0 - t * abs(sx0)), float(x0 + t * abs(sx0))],
            "exact": [None if lo is None else float(max(lo, 0.0)), None if hi is None else float(hi)], "t": t}


def quadratic_inverse(x, y, weighting, y0, m, level):
    """Quadratic: root on the standards' branch; delta-method s_x0 two ways; exact interval by numpy.roots."""
    n = len(x)
    w, wscale = normalised_weights(x, weighting)
    X = design(x, [0, 1, 2])
    sw = np.sqrt(w)
    coef, *_ = np.linalg.lstsq(X * sw[:, None], y * sw, rcond=None)
    a, b, c = coef
    r = y - X @ coef
    s = np.sqrt(np.sum(w * r ** 2) / (n - 3))
    C = np.linalg.inv((X * w[:, None]).T @ X)  # unscaled (X'WX)^-1
    roots = np.roots([c, b, a - y0])
    roots = np.real(roots[np.abs(np.imag(roots)) < 1e-12])
    vertex = -b / (2 * c)
    mid = 0.5 * (x.min() + x.max())
    x0 = float([rt for rt in roots if np.sign(rt - vertex) == np.sign(mid - vertex)][0])
    k = weight_power(weighting)
    w0 = x0 ** (-k) / wscale if k else 1.0
    phi = np.array([1, x0, x0 ** 2])
    slope = b + 2 * c * x0
    sx0 = s * np.sqrt(1 / (m * w0) + phi @ C @ phi) / abs(slope)
    out = {"amount": x0, "standardError": float(sx0), "t": t975(n - 3, level)}
    if k == 0:
        # ISO 8466-2 form (from memory): s_x0 = (s/E) sqrt(1/N + 1/m + [(x0 - xbar)^2 Qx4 + (x0^2 - Sx2/N)^2 Qxx
        #   - 2 (x0 - xbar)(x0^2 - Sx2/N) Qx3] / (Qxx Qx4 - Qx3^2)), E = b + 2 c x0.
        xbar = x.mean()
        qxx = np.sum((x - xbar) ** 2)
        qx3 = np.sum(x ** 3) - np.sum(x) * np.sum(x ** 2) / n
        qx4 = np.sum(x ** 4) - np.sum(x ** 2) ** 2 / n
        sx2n = np.sum(x ** 2) / n
        inner = ((x0 - xbar) ** 2 * qx4 + (x0 ** 2 - sx2n) ** 2 * qxx - 2 * (x0 - xbar) * (x0 ** 2 - sx2n) * qx3) / (qxx * qx4 - qx3 ** 2)
        out["standardErrorIso84662"] = float((s / abs(slope)) * np.sqrt(1 / n + 1 / m + inner))
    P = np.polynomial.Polynomial
    g = P([y0 - a, -b, -c])
    fitvar = P([0.0])
    for i in range(3):
        for j in range(3):
            fitvar = fitvar + P([0.0] * (i + j) + [C[i, j]])
    var = fitvar + P([0] * k + [(wscale if k else 1.0) / m])
    t = out["t"]
    h = g ** 2 - t ** 2 * s ** 2 * var
    hr = h.roots()
    hr = np.sort(np.real(hr[np.abs(np.imag(hr)) < 1e-9]))
    lo = max([r for r in hr if r < x0], default=None)
    hi = min([r for r in hr if r > x0], default=None)
    if k and (lo is None or lo < 0):
        lo = 0.0
    out["exact"] = [None if lo is None else float(lo), None if hi is None else float(hi)]
    out["symmetric"] = [float(x0 - t * sx0), float(x0 + t * sx0)]
    return out


def inverse_cases():
    cases = []
    # Miller & Miller 2010, Example 5.3.1 / 5.6.1 data (fluorescence standards, from memory of the book).
    xm = np.array([0, 2, 4, 6, 8, 10, 12], dtype=float)
    ym = np.array([2.1, 5.0, 9.0, 12.6, 17.3, 21.0, 24.7])
    for y0 in [2.9, 13.5, 23.0]:
        cases.append({"name": f"miller-fluorescence y0={y0}", "model": "line", "weighting": "none", "amounts": fl(xm), "responses": fl(ym),
                      "response": y0, "replicates": 1, "level": 0.95, **miller_line(xm, ym, y0, 1, 0.95)})
    # Seeded lines: duplicates, a response near each end and beyond the range, one and three replicates, 90 % and 99 %.
    x = np.repeat(np.array([1.0, 2.0, 4.0, 7.0, 10.0]), 2)
    y = 0.4 + 0.9 * x + rng.normal(0, 0.15, x.size)
    for y0, m, level in [(1.0, 1, 0.95), (5.0, 3, 0.95), (9.5, 1, 0.99), (12.0, 2, 0.90)]:
        cases.append({"name": f"seeded-line y0={y0} m={m} level={level}", "model": "line", "weighting": "none", "amounts": fl(x), "responses": fl(y),
                      "response": y0, "replicates": m, "level": level, **miller_line(x, y, y0, m, level)})
    # A weak slope: g close to 1, wide Fieller interval, very different from the symmetric one.
    xw_ = np.array([1.0, 2.0, 3.0, 4.0, 5.0])
    yw_ = 1.0 + 0.1 * xw_ + rng.normal(0, 0.08, xw_.size)
    cases.append({"name": "weak-slope", "model": "line", "weighting": "none", "amounts": fl(xw_), "responses": fl(yw_),
                  "response": 1.35, "replicates": 1, "level": 0.95, **miller_line(xw_, yw_, 1.35, 1, 0.95)})
    # Weighted lines.
    x = np.repeat(np.array([0.5, 1.0, 2.0, 5.0, 10.0]), 2)
    y = 0.02 + 1.3 * x + x * rng.normal(0, 0.04, x.size)
    for weighting in ["1/x", "1/x2"]:
        for y0, m in [(0.8, 1), (6.0, 2), (12.5, 1)]:
            cases.append({"name": f"weighted-line {weighting} y0={y0} m={m}", "model": "line", "weighting": weighting, "amounts": fl(x), "responses": fl(y),
                          "response": y0, "replicates": m, "level": 0.95, **miller_weighted_line(x, y, weighting, y0, m, 0.95)})
    # Quadratics.
    x = np.repeat(np.array([1.0, 2.0, 4.0, 6.0, 8.0, 10.0]), 2)
    y = 0.1 + 2.0 * x - 0.06 * x ** 2 + rng.normal(0, 0.06, x.size)
    for weighting in ["none", "1/x", "1/x2"]:
        for y0, m in [(2.5, 1), (9.0, 1), (13.0, 3)]:
            cases.append({"name": f"quadratic {weighting} y0={y0} m={m}", "model": "quadratic", "weighting": weighting, "amounts": fl(x), "responses": fl(y),
                          "response": y0, "replicates": m, "level": 0.95, **quadratic_inverse(x, y, weighting, y0, m, 0.95)})
    return cases


def main():
    data = {
        "generatedBy": "test/reference/make_calibration.py",
        "scipy": scipy.__version__,
        "numpy": np.__version__,
        "distributions": distributions(),
        "fits": fit_cases(),
        "inverse": inverse_cases(),
    }
    OUT.write_text(json.dumps(data, indent=1, allow_nan=False) + "\n")
    print(f"wrote {OUT} (SciPy {scipy.__version__}, NumPy {np.__version__})")


if __name__ == "__main__":
    main()
