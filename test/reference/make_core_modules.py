#!/usr/bin/env python3
"""Reference values for the own test files of small core modules
(test/core/numeric/{convolve,fft,polynomial}.test.ts, test/core/steps/resample.test.ts):

- padIndex (src/core/numeric/convolve.ts): numpy.pad of arange(n) with NumPy's
  names for SciPy's modes (NumPy 'symmetric' = SciPy 'reflect', 'reflect' =
  'mirror', 'edge' = 'nearest', 'wrap' = 'wrap'), and scipy.ndimage.correlate1d
  of short signals with kernels longer than the signal (several reflections);
- dft / powerSpectrum (src/core/numeric/fft.ts): numpy.fft.fft / ifft of
  seeded complex vectors of power-of-two and other lengths, and
  scipy.signal.periodogram(window='boxcar', detrend=False, scaling='spectrum');
- polynomial roots (src/core/numeric/polynomial.ts): numpy.polynomial.polynomial.polyroots
  of seeded polynomials, real roots only;
- resampleLinear (src/core/steps/resample.ts): numpy.interp onto numpy.linspace.

Run from the repository root:  python3 test/reference/make_core_modules.py
Writes test/reference/core-modules.json with the SciPy and NumPy versions used.
Inputs are invented by seeded code here and stored in the JSON.
"""
import json
import pathlib

import numpy as np
import scipy
from scipy import ndimage, signal

OUT = pathlib.Path(__file__).with_name("core-modules.json")
rng = np.random.default_rng(20261203)

NUMPY_NAME = {"reflect": "symmetric", "mirror": "reflect", "nearest": "edge", "wrap": "wrap"}

pad = []
for n in [1, 2, 3, 5]:
    for mode, np_mode in NUMPY_NAME.items():
        if n == 1 and np_mode == "reflect":
            continue  # numpy.pad 'reflect' of one value is that value; kept below as SciPy does
        width = 13
        idx = np.pad(np.arange(n), width, mode=np_mode)
        pad.append({"n": n, "mode": mode, "from": -width, "index": idx.tolist()})

correlate = []
for n, w in [(5, 9), (3, 11), (7, 5), (1, 3)]:
    y = rng.normal(size=n)
    k = rng.normal(size=w)
    for mode in ["reflect", "mirror", "nearest", "wrap", "constant"]:
        out = ndimage.correlate1d(y, k, mode=mode, cval=0.0)
        correlate.append({"mode": mode, "y": y.tolist(), "kernel": k.tolist(), "out": out.tolist()})

dft = []
for n in [1, 2, 3, 5, 7, 8, 12, 16, 17, 100, 127]:
    re = rng.normal(size=n)
    im = rng.normal(size=n)
    z = re + 1j * im
    f = np.fft.fft(z)
    g = np.fft.ifft(z)
    dft.append({"re": re.tolist(), "im": im.tolist(),
                "fre": f.real.tolist(), "fim": f.imag.tolist(),
                "ire": g.real.tolist(), "iim": g.imag.tolist()})

spectra = []
for n, dx in [(64, 0.5), (99, 0.02), (10, 1.0), (11, 3.0)]:
    y = 2.0 + rng.normal(size=n)
    freq, power = signal.periodogram(y, fs=1.0 / dx, window="boxcar", detrend=False, scaling="spectrum")
    spectra.append({"dx": dx, "y": y.tolist(), "freq": freq.tolist(), "power": power.tolist()})

roots = []
for degree in [3, 4, 5, 6]:
    for _ in range(3):
        c = rng.normal(size=degree + 1)
        r = np.polynomial.polynomial.polyroots(c)
        real = sorted(float(v.real) for v in r if abs(v.imag) < 1e-12)
        roots.append({"coefficients": c.tolist(), "realRoots": real})

resample = []
for n, m in [(12, 20), (40, 17), (7, 7)]:
    x = np.cumsum(rng.uniform(0.1, 2.0, size=n))
    y = np.sin(x) + 0.1 * rng.normal(size=n)
    grid = np.linspace(x[0], x[-1], m)
    resample.append({"x": x.tolist(), "y": y.tolist(), "count": m, "gridX": grid.tolist(), "gridY": np.interp(grid, x, y).tolist()})

OUT.write_text(json.dumps({
    "scipy": scipy.__version__, "numpy": np.__version__,
    "pad": pad, "correlate": correlate, "dft": dft, "spectra": spectra, "roots": roots, "resample": resample,
}, indent=1) + "\n")
print(f"wrote {OUT}")
