"""Hand-made noise figures for the real traces in test/fixtures/real.

Writes test/reference/real-noise.json next to this script. Independent of
the code under test: plain NumPy on the CSV files as exported by
scripts/export-real-traces.R.

MALDI-TOF (MALDIquant fiedler2009subset items 1 and 2 are technical
replicates of one serum sample): in m/z ranges picked by eye as free of
peaks (plots of both replicates looked at 2026-12-02: 4860-4950, 8280-8480,
9700-10000), the difference of the replicates, less a fitted straight line
(their baselines differ by an offset), has twice the variance of one
spectrum's noise when the two noises are independent and equal:
sigma = SD(difference about the line) / sqrt(2). Its autocorrelation at lags
1-8 is the noise's, for the same reason. Peak-free by eye is a judgement;
small shared bumps cancel only as far as the replicates have equal
intensity.

NIR (pls gasoline): no replicates exist, so two figures that bracket the
noise, both assuming white noise: (a) residuals about a least-squares
quadratic in consecutive 7-point windows (14 nm), pooled, E[SS] =
sigma^2 * (7 - 3) per window: an upper figure, since band curvature that a
quadratic cannot follow over 14 nm counts as noise; (b) 1.4826 x the median
absolute deviation of the 2nd, 3rd and 4th differences over the whole
spectrum, / sqrt(sum of squared coefficients): the finest scale, where band
shape is smallest (no features masked, unlike the code under test).

Run:  python3 test/reference/make_real_noise.py   (NumPy 2.4)
"""
import json
import pathlib
from math import comb

import numpy as np

HERE = pathlib.Path(__file__).parent
REAL = HERE.parent / 'fixtures' / 'real'


def load(name):
    rows = [line.strip().split(',') for line in open(REAL / name, encoding='utf-8')]
    data = [r for r in rows if r and r[0][:1].isdigit()]
    return np.array([[float(v) for v in r] for r in data])


def maldi():
    a = load('maldi-fiedler2009-01.csv')
    b = load('maldi-fiedler2009-02.csv')
    assert np.array_equal(a[:, 0], b[:, 0])
    out = []
    for lo, hi in [(4860, 4950), (8280, 8480), (9700, 10000)]:
        s = (a[:, 0] >= lo) & (a[:, 0] <= hi)
        idx = np.flatnonzero(s)
        d = a[s, 1] - b[s, 1]
        t = np.arange(d.size, dtype=float)
        e = d - np.polyval(np.polyfit(t, d, 1), t)
        rho = [float(np.sum(e[:-k] * e[k:]) / np.sum(e * e)) for k in range(1, 9)]
        out.append({
            'mz_from': lo, 'mz_to': hi, 'index_from': int(idx[0]), 'index_to': int(idx[-1]),
            'points': int(d.size),
            'level_1': float(np.median(a[s, 1])), 'level_2': float(np.median(b[s, 1])),
            'sigma': float(e.std(ddof=2) / np.sqrt(2)),
            'rho': rho,
        })
    return out


def nir():
    g = load('gasoline-nir.csv')
    out = []
    for col in range(1, g.shape[1]):
        y = g[:, col]
        w = 7
        ss, nwin = 0.0, 0
        t = np.arange(w, dtype=float)
        for a in range(0, y.size - w + 1, w):
            seg = y[a:a + w]
            r = seg - np.polyval(np.polyfit(t, seg, 2), t)
            ss += float(r @ r)
            nwin += 1
        finest = {}
        for order in (2, 3, 4):
            c = np.array([(-1) ** (order - k) * comb(order, k) for k in range(order + 1)], float)
            dd = np.convolve(y, c, 'valid')
            mad = np.median(np.abs(dd - np.median(dd)))
            finest[str(order)] = float(1.482602218505602 * mad / np.sqrt(np.sum(c * c)))
        out.append({
            'sample': col, 'sigma_quadratic_7': float(np.sqrt(ss / (nwin * (w - 3)))),
            'sigma_mad_differences': finest,
            'range': float(y.max() - y.min()),
        })
    return out


result = {
    'numpy': np.__version__,
    'maldi_replicates_1_2': maldi(),
    'nir': nir(),
}
(HERE / 'real-noise.json').write_text(json.dumps(result, indent=1) + '\n', encoding='utf-8')
print(json.dumps({'maldi': result['maldi_replicates_1_2']}, indent=1))
for key in ('sigma_quadratic_7',):
    s = np.array([r[key] for r in result['nir']])
    print('nir', key, 'median', np.median(s), 'min', s.min(), 'max', s.max())
for o in ('2', '3', '4'):
    s = np.array([r['sigma_mad_differences'][o] for r in result['nir']])
    print('nir differences order', o, 'median', np.median(s), 'min', s.min(), 'max', s.max())
