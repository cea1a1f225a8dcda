"""S/N of a few peaks of a real MALDI-TOF spectrum, worked out by hand.

Trace: test/fixtures/real/maldi-fiedler2009-01.csv (MALDIquant 1.22,
fiedler2009subset item 1; GPL-3+; see the README there). Nobody on the project
made it. For each peak listed below (chosen by eye: tall, with no neighbour
within three of its widths), the steps are deliberately plain, written out so
a reader can redo them on paper from the CSV:

1. apex: the largest sample within +-10 samples of the m/z given;
2. W: the peak's width in samples, read off the data: the number of samples
   at or above half the apex height over the baseline of step 3 (iterated
   once from a first guess of 35 samples);
3. baseline: the straight line through the mean points (m/z and intensity)
   of two windows of W samples, from 2W to 3W samples either side of the
   apex;
4. H: the apex sample's intensity minus that line at the apex;
5. sigma: the noise near the peak's base, from the same two windows: the
   standard deviation of the second differences y[i-1] - 2y[i] + y[i+1],
   divided by sqrt(6) (white noise gives second differences of variance
   6 sigma^2; a smooth baseline adds almost nothing to them);
6. S/N = H / sigma.

Writes test/reference/real-snr.json. Run:  python3 test/reference/make_real_snr.py
"""
import json
import math
import pathlib

import numpy as np

HERE = pathlib.Path(__file__).parent
FILE = HERE.parent / "fixtures" / "real" / "maldi-fiedler2009-01.csv"
PEAKS_MZ = [2660.2, 3191.6, 4209.7, 5904.6, 7766.2]


def load(path):
    xs, ys = [], []
    for line in open(path, encoding="utf8"):
        parts = line.strip().split(",")
        if len(parts) != 2:
            continue
        try:
            xs.append(float(parts[0]))
            ys.append(float(parts[1]))
        except ValueError:
            pass
    return np.array(xs), np.array(ys)


def by_hand(x, y, mz):
    c = int(np.argmin(np.abs(x - mz)))
    i = c - 10 + int(np.argmax(y[c - 10:c + 11]))
    W = 35
    for _ in range(2):
        left = np.arange(i - 3 * W, i - 2 * W)
        right = np.arange(i + 2 * W + 1, i + 3 * W + 1)
        xl, yl = x[left].mean(), y[left].mean()
        xr, yr = x[right].mean(), y[right].mean()
        base = lambda t: yl + (yr - yl) * (t - xl) / (xr - xl)
        H = y[i] - base(x[i])
        above = [k for k in range(i - 3 * W, i + 3 * W) if y[k] - base(x[k]) >= H / 2]
        W = len(above)
    d2 = np.concatenate([np.diff(y[left], 2), np.diff(y[right], 2)])
    sigma = float(np.std(d2, ddof=1) / math.sqrt(6))
    return {"mz": float(x[i]), "index": i, "width_samples": W, "baseline_at_apex": float(base(x[i])),
            "height": float(H), "sigma": sigma, "snr": float(H / sigma)}


def main():
    x, y = load(FILE)
    rows = [by_hand(x, y, mz) for mz in PEAKS_MZ]
    out = {"file": FILE.name, "numpy": np.__version__, "peaks": rows}
    path = HERE / "real-snr.json"
    path.write_text(json.dumps(out, indent=1) + "\n")
    for r in rows:
        print(r)
    print("wrote", path)


if __name__ == "__main__":
    main()
