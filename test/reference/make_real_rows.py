"""Rows of the MALDI-TOF peak table that the width limit at shared valleys,
the rule against non-positive areas and the same-top merge changed, worked
out by hand from the raw samples (issue 14). NumPy only.

Trace: test/fixtures/real/maldi-fiedler2009-01.csv (MALDIquant 1.22,
fiedler2009subset item 1; GPL-3+; see the README there).

1. m/z 3302.1 (apex sample 16024). Before, it shared valleys 26 and 49
   samples out although its half-height width is about 6 samples, and its
   area came out -874 (the line under its group ran above the trace).
   By hand, with the table's own width limit (8 half-widths a side) as the
   stretch looked at:
   * apex: largest sample within +-3 of 16024;
   * baseline: the straight line through the mean points (m/z, intensity)
     of the 5 samples ending 8 half-widths before the apex and the 5
     starting 8 half-widths after it, the half-width W/2 taken from W, the
     count of samples at or above half the apex height over that line
     (iterated from W = 6);
   * H: 5-point least-squares parabola through the top above the line, at
     its vertex (the table's own apex rule for a 6-sample width uses 3
     points; 5 points average some noise);
   * area: trapezoid rule of (trace - line) between the two window edges;
   * sigma_finest: SD of second differences / sqrt(6) over 200 samples
     either side (make_real_snr.py's recipe; on this correlated noise about
     half the table's sigma, so no S/N is compared, see noise-real.test.ts).
   Only the sign of the area and the height within a stated margin are
   checked against the table: the hand line is one reasonable line, not the
   table's.
2. The pair at m/z 2755.4 (a small peak on the rising flank of m/z 2769.3):
   is it one peak or two close ones? Its top holds two maxima 10 samples
   apart (samples 12933 and 12943) with a dip between them. The dip is
   compared with the noise of a 5-point box average of this trace's
   correlated noise, measured directly: the SD of the 5-point box average
   of the replicate difference (spectra 01 - 02) / sqrt 2 over the three
   peak-free ranges of make_real_noise.py. A dip under 3 sigma_5 is within
   noise: one peak.

Writes test/reference/real-rows.json. Run:  python3 test/reference/make_real_rows.py
"""
import json
import pathlib
import sys

import numpy as np

HERE = pathlib.Path(__file__).parent
sys.path.insert(0, str(HERE))
from make_real_snr import load as load_path  # noqa: E402  (one reader for the exported spectra)
REAL = HERE.parent / "fixtures" / "real"


def load(name):
    """One exported MALDI spectrum (m/z, counts), read as make_real_snr.py reads it."""
    return load_path(REAL / name)


x, y = load("maldi-fiedler2009-01.csv")
# Rows the change moved by more than 4 % in area, with S/N over 10 and no neighbour within 2-3 of their widths
# (file, m/z, first guess of the width in samples).
# (m/z 2931.6 of spectrum 09 also moved, but its neighbour at 2951.8 lies in the hand windows: left out.)
ROWS = [("maldi-fiedler2009-02.csv", 2553.9, 33), ("maldi-fiedler2009-09.csv", 2768.6, 33)]
_, y2 = load("maldi-fiedler2009-02.csv")


def sigma_near(i, half=200):
    seg = y[i - half:i + half + 1]
    d2 = seg[:-2] - 2 * seg[1:-1] + seg[2:]
    return float(np.std(d2) / np.sqrt(6))


def row_by_hand(name, mz, W0):
    """make_real_snr.py's steps, plus the area: apex, W, baseline through windows 2W-3W out, H, area between
    the windows' inner edges (apex +- 2W: a Gaussian of half-height width W holds all but 1e-5 of its area there)."""
    x, y = load(name)
    c = int(np.argmin(np.abs(x - mz)))
    i = c - 5 + int(np.argmax(y[c - 5:c + 6]))
    W = W0
    for _ in range(2):
        left = np.arange(i - 3 * W, i - 2 * W)
        right = np.arange(i + 2 * W + 1, i + 3 * W + 1)
        xl, yl, xr, yr = x[left].mean(), y[left].mean(), x[right].mean(), y[right].mean()
        base = lambda t: yl + (yr - yl) * (t - xl) / (xr - xl)
        H = y[i] - base(x[i])
        seg = np.arange(i - 2 * W, i + 2 * W + 1)
        W = max(3, int(np.sum(y[seg] - base(x[seg]) >= H / 2)))
    seg = np.arange(i - 2 * W, i + 2 * W + 1)
    area = float(np.trapezoid(y[seg] - base(x[seg]), x[seg]))
    return {"file": name, "mz": float(x[i]), "index": int(i), "width_samples": W, "height": float(H), "area": area}


def local_by_hand(i0):
    """A narrow peak between close neighbours: the stretch is the table's own width limit, 8 half-widths a side."""
    i = i0 - 3 + int(np.argmax(y[i0 - 3:i0 + 4]))
    W = 6  # first guess; counted once against the line it gives (the stretch stays fixed, off the neighbours)
    reach = int(np.ceil(8 * W / 2))
    left = np.arange(i - reach - 4, i - reach + 1)
    right = np.arange(i + reach, i + reach + 5)
    xl, yl, xr, yr = x[left].mean(), y[left].mean(), x[right].mean(), y[right].mean()
    base = lambda t: yl + (yr - yl) * (t - xl) / (xr - xl)
    seg = np.arange(i - reach, i + reach + 1)
    above = y[seg] - base(x[seg])
    W = int(np.sum(above >= (y[i] - base(x[i])) / 2))
    k = np.arange(i - 2, i + 3)
    t = x[k] - x[i]
    c2, c1, c0 = np.polyfit(t, y[k] - base(x[k]), 2)
    H = c0 - c1 * c1 / (4 * c2) if c2 < 0 else y[i] - base(x[i])
    area = float(np.trapezoid(above, x[seg]))
    s = sigma_near(i)
    return {"index": int(i), "mz": float(x[i]), "width_samples": W, "reach_samples": reach, "height": float(H),
            "area": area, "sigma_finest": s}


# The noise of a 5-point box average, straight from the replicate difference (spectra 01 - 02, whose noise is
# independent and alike: the difference has twice the variance) over the peak-free ranges of make_real_noise.py:
# this carries the noise's strong correlation (rho_1 0.6-0.8) without a model of it.
ref = json.loads((HERE / "real-noise.json").read_text())
b5 = []
for r in ref["maldi_replicates_1_2"]:
    d = (y - y2)[r["index_from"]:r["index_to"]]
    b5.append(np.convolve(d, np.ones(5) / 5, mode="valid") / np.sqrt(2))
s5 = float(np.std(np.concatenate([v - v.mean() for v in b5])))

a, b = 12933, 12943
box = lambda yy, j: float(yy[j - 2:j + 3].mean())
dip_at = a + int(np.argmin([box(y, j) for j in range(a, b + 1)]))
dip = min(box(y, a), box(y, b)) - box(y, dip_at)
# The technical replicate (spectrum 02, the same serum sample measured again): local maxima of its 5-point box
# average over the same stretch, and its own largest dip between two of them.
b02 = np.array([box(y2, j) for j in range(a - 10, b + 11)])
max02 = [int(a - 10 + k) for k in range(1, len(b02) - 1) if b02[k] > b02[k - 1] and b02[k] >= b02[k + 1]]
out = {
    "numpy": np.__version__,
    "file": "maldi-fiedler2009-01.csv",
    "narrow_between_neighbours": local_by_hand(16024),
    "rows": [row_by_hand(f, mz, w0) for f, mz, w0 in ROWS],
    "doublet": {
        "maxima": [a, b], "mz": [float(x[a]), float(x[b])], "dip_index": dip_at,
        "box5_at_maxima": [box(y, a), box(y, b)], "box5_at_dip": box(y, dip_at),
        "sigma_box5_replicates": s5,
        "dip_over_sigma_box5": float(dip / s5),
        "replicate_02_box5_maxima": max02,
        "replicate_02_box5": b02.tolist(),
        # Two peaks only if the dip stands out of the noise (3 sigma_5, before allowing for having picked the two
        # highest and the lowest box averages after looking) AND the replicate shows two maxima there too.
        "verdict": "two peaks" if dip >= 3 * s5 and len(max02) >= 2 else "one peak",
    },
}
(HERE / "real-rows.json").write_text(json.dumps(out, indent=1) + "\n")
print(json.dumps(out, indent=1))
