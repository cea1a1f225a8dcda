"""Reference values for region fitting, computed with SciPy.

Writes test/reference/fit.json next to this script:
* erfc / erfcx at chosen points (scipy.special);
* the unit-area EMG density on a grid (scipy.stats.exponnorm, an independent
  implementation of the same density);
* three least-squares cases solved with scipy.optimize.curve_fit (method
  'lm', MINPACK), each with its data stored in full, the fitted parameters,
  their standard errors sqrt(diag(pcov)) (absolute_sigma=False, the
  covariance scaled by SSR/(n - p)), and the areas' standard errors by the
  delta method;
* mean, sample SD (ddof=1) and %RSD for the batch combiner test.

The model is written here independently of the TypeScript: the same
parameters in the same order (peaks left to right, then the baseline
b0 + b1*t (+ b2*t^2) with t = (x - centre)/halfSpan).

Run:  python3 test/reference/make_fit.py
"""
import json
import pathlib

import numpy as np
import scipy
from scipy import optimize, special, stats

rng = np.random.default_rng(20261803)
LN2 = np.log(2.0)


def gaussian(x, c, h, w):
    return h * np.exp(-4 * LN2 * (x - c) ** 2 / w ** 2)


def lorentzian(x, c, h, w):
    return h / (1 + 4 * (x - c) ** 2 / w ** 2)


def pseudo_voigt(x, c, h, w, eta):
    return h * (eta * lorentzian(x, c, 1.0, w) + (1 - eta) * gaussian(x, c, 1.0, w))


def emg(x, mu, area, sigma, tau):
    return area * stats.exponnorm.pdf(x, tau / sigma, loc=mu, scale=sigma)


SHAPES = {"gaussian": (gaussian, 3), "lorentzian": (lorentzian, 3), "pseudo-voigt": (pseudo_voigt, 4), "emg": (emg, 4)}


def model_for(shapes, baseline, x):
    centre = 0.5 * (x[0] + x[-1])
    half = 0.5 * (x[-1] - x[0])
    t = (x - centre) / half
    nb = 3 if baseline == "quadratic" else 2

    def f(xx, *p):
        tt = (xx - centre) / half
        out = p[-nb] + p[-nb + 1] * tt
        if nb == 3:
            out = out + p[-1] * tt * tt
        o = 0
        for s in shapes:
            fn, k = SHAPES[s]
            out = out + fn(xx, *p[o:o + k])
            o += k
        return out

    return f, t


def area_and_grad(shape, p):
    """Area of one peak and its gradient with respect to that peak's parameters."""
    ga = np.sqrt(np.pi / (4 * LN2))
    if shape == "gaussian":
        c, h, w = p
        return ga * h * w, [0, ga * w, ga * h]
    if shape == "lorentzian":
        c, h, w = p
        return np.pi / 2 * h * w, [0, np.pi / 2 * w, np.pi / 2 * h]
    if shape == "pseudo-voigt":
        c, h, w, eta = p
        a = eta * np.pi / 2 + (1 - eta) * ga
        return a * h * w, [0, a * w, a * h, (np.pi / 2 - ga) * h * w]
    mu, area, sigma, tau = p
    return area, [0, 1, 0, 0]


def case(name, shapes, baseline, truth, noise, x, p0):
    f, _ = model_for(shapes, baseline, x)
    y = f(x, *truth) + rng.normal(0, noise, x.size)
    popt, pcov = optimize.curve_fit(f, x, y, p0=p0, method="lm", ftol=1e-14, xtol=1e-14, gtol=1e-14, maxfev=100000)
    perr = np.sqrt(np.diag(pcov))
    areas, area_se = [], []
    o = 0
    for s in shapes:
        k = SHAPES[s][1]
        a, g = area_and_grad(s, popt[o:o + k])
        g = np.asarray(g, dtype=float)
        areas.append(float(a))
        area_se.append(float(np.sqrt(g @ pcov[o:o + k, o:o + k] @ g)))
        o += k
    resid = y - f(x, *popt)
    return {
        "name": name, "shapes": shapes, "baseline": baseline, "x": x.tolist(), "y": y.tolist(),
        "truth": list(truth), "p0": list(p0), "params": popt.tolist(), "se": perr.tolist(),
        "areas": areas, "areaSe": area_se, "ssr": float(resid @ resid),
    }


cases = []
x = np.linspace(2.0, 8.0, 501)
cases.append(case("two Gaussians on a sloped line", ["gaussian", "gaussian"], "line",
                  [4.6, 2.0, 0.55, 5.3, 0.7, 0.5, 0.30, 0.12], 0.02, x,
                  [4.55, 1.8, 0.6, 5.35, 0.6, 0.45, 0.3, 0.1]))
x = np.linspace(0.0, 10.0, 401)
cases.append(case("Lorentzian and pseudo-Voigt on a quadratic baseline", ["lorentzian", "pseudo-voigt"], "quadratic",
                  [4.0, 1.5, 0.8, 6.0, 1.0, 1.2, 0.4, 0.2, -0.05, 0.08], 0.015, x,
                  [4.1, 1.4, 0.9, 5.9, 1.1, 1.0, 0.5, 0.2, 0.0, 0.0]))
x = np.linspace(10.0, 16.0, 601)
cases.append(case("EMG and Gaussian on a sloped line", ["emg", "gaussian"], "line",
                  [11.8, 0.9, 0.15, 0.3, 13.6, 0.6, 0.4, 0.05, 0.02], 0.01, x,
                  [11.85, 0.8, 0.17, 0.25, 13.55, 0.55, 0.45, 0.05, 0.0]))

pts = [-6, -3, -1.5, -0.7, -0.1, 0.0, 0.2, 0.9, 1.49, 1.5, 1.51, 2.3, 4.0, 9.0, 27.0, 300.0]
special_values = {"x": pts, "erfc": special.erfc(pts).tolist(), "erfcx": special.erfcx(pts).tolist()}

grid = np.linspace(-4, 12, 161)
emg_grid = {
    "x": grid.tolist(),
    "cases": [
        {"mu": mu, "sigma": s, "tau": t, "pdf": stats.exponnorm.pdf(grid, t / s, loc=mu, scale=s).tolist()}
        for mu, s, t in [(0.0, 1.0, 0.5), (1.0, 0.5, 2.0), (2.0, 1.0, 0.01), (0.5, 0.3, 4.0)]
    ],
}

batch_values = {
    "rt": [[5.012, 5.020, 4.998, 5.007], [7.51, 7.49, 7.55, 7.52]],
    "area": [[101.2, 99.8, 100.5, 102.0], [40.1, 39.0, 41.2, 40.6]],
}
batch_values["stats"] = [
    {k: {"mean": float(np.mean(v[i])), "sd": float(np.std(v[i], ddof=1)), "rsd": float(100 * np.std(v[i], ddof=1) / np.mean(v[i]))}
     for k, v in batch_values.items() if k in ("rt", "area")}
    for i in range(2)
]

out = {
    "scipy": scipy.__version__, "numpy": np.__version__,
    "special": special_values, "emgPdf": emg_grid, "cases": cases, "batch": batch_values,
}
path = pathlib.Path(__file__).with_name("fit.json")
path.write_text(json.dumps(out, indent=1) + "\n")
print(f"wrote {path} (SciPy {scipy.__version__}, NumPy {np.__version__})")
for c in cases:
    print(c["name"], np.round(c["params"], 5), "se", np.round(c["se"], 6))
