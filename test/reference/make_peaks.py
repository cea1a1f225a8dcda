"""Reference values for the peak primitives, computed with SciPy.

Writes test/reference/peaks.json next to this script. The traces are
invented here from a seeded NumPy generator and stored in full, so the
TypeScript tests read exactly the numbers SciPy saw.

Run:  python3 test/reference/make_peaks.py
Used: scipy.signal.find_peaks, peak_prominences, peak_widths, and SciPy's
own distance rule (scipy.signal._peak_finding_utils._select_by_peak_distance)
applied after a prominence filter, the order our detector uses.
"""
import json
import pathlib

import numpy as np
import scipy
from scipy import signal
from scipy.signal._peak_finding_utils import _select_by_peak_distance

rng = np.random.default_rng(20260412)


def gaussians(x, specs):
    out = np.zeros_like(x)
    for centre, height, sigma in specs:
        out += height * np.exp(-0.5 * ((x - centre) / sigma) ** 2)
    return out


def make_traces():
    traces = {}
    x = np.arange(2000, dtype=float)
    # Several peaks of different widths on a sloping baseline, white noise.
    y = gaussians(x, [(150, 40, 6), (420, 12, 3), (455, 25, 10), (900, 8, 4),
                      (1300, 60, 20), (1340, 15, 5), (1995, 30, 8), (4, 20, 3)])
    y += 0.002 * x + rng.normal(0, 1.0, x.size)
    traces["noisy-multi"] = y
    # Quantised signal: whole numbers make flat tops (plateaus) and ties.
    y = gaussians(x, [(300, 30, 15), (800, 12, 4), (1500, 50, 40)]) + rng.normal(0, 1.5, x.size)
    traces["quantised"] = np.round(y)
    # Pure white noise: thousands of maxima, every kind of base.
    traces["white-noise"] = rng.normal(0, 1.0, x.size)
    # Lightly smoothed noisy peaks (5-point moving average), as a processed trace would look.
    y = gaussians(x, [(200, 10, 8), (600, 5, 3), (1000, 20, 25), (1700, 3, 5)]) + rng.normal(0, 0.8, x.size)
    traces["smoothed"] = np.convolve(y, np.ones(5) / 5, mode="same")
    return traces


def has_ties(values):
    return len(np.unique(values)) != len(values)


def describe(name, y):
    maxima, _ = signal.find_peaks(y)
    prom, lb, rb = signal.peak_prominences(y, maxima)
    prom_w, lb_w, rb_w = signal.peak_prominences(y, maxima, wlen=51)
    w05 = signal.peak_widths(y, maxima, rel_height=0.5, prominence_data=(prom, lb, rb))
    w10 = signal.peak_widths(y, maxima, rel_height=1.0, prominence_data=(prom, lb, rb))
    sd = float(np.std(np.diff(y)) / np.sqrt(2))
    min_prom = 4 * sd
    distance = 25
    fp_pd, _ = signal.find_peaks(y, prominence=min_prom, distance=distance)
    fp_p, props = signal.find_peaks(y, prominence=min_prom)
    keep = _select_by_peak_distance(fp_p, y[fp_p].astype(np.float64), float(distance))
    fp_p_then_d = fp_p[keep]
    fp_w, _ = signal.find_peaks(y, prominence=min_prom, width=4.0)
    dist_tie_free = not has_ties(y[maxima])
    return {
        "name": name,
        "y": y.tolist(),
        "maxima": maxima.tolist(),
        "prominences": prom.tolist(),
        "leftBases": lb.tolist(),
        "rightBases": rb.tolist(),
        "wlen": 51,
        "prominencesWlen": prom_w.tolist(),
        "leftBasesWlen": lb_w.tolist(),
        "rightBasesWlen": rb_w.tolist(),
        "widths05": {k: v.tolist() for k, v in zip(["widths", "heights", "left", "right"], w05)},
        "widths10": {k: v.tolist() for k, v in zip(["widths", "heights", "left", "right"], w10)},
        "minProminence": min_prom,
        "distance": distance,
        "distanceTieFree": dist_tie_free,
        "findPeaksProminenceDistance": fp_pd.tolist(),
        "findPeaksProminence": fp_p.tolist(),
        "prominenceThenDistance": fp_p_then_d.tolist(),
        # SciPy breaks height ties through NumPy's unstable argsort; compare only tie-free cases.
        "prominenceThenDistanceTieFree": not has_ties(y[fp_p]),
        "minWidthSamples": 4.0,
        "findPeaksProminenceWidth": fp_w.tolist(),
        "distance3Maxima": signal.find_peaks(y, distance=3)[0].tolist() if dist_tie_free else None,
    }


def small_examples():
    out = {}
    y = np.array([0, 1, 3, 7, 3, 1, 0], dtype=float)
    p, _ = signal.find_peaks(y)
    pr = signal.peak_prominences(y, p)
    out["triangle"] = {
        "peaks": p.tolist(), "prominences": pr[0].tolist(),
        "leftBases": pr[1].tolist(), "rightBases": pr[2].tolist(),
        "w05": [a.tolist() for a in signal.peak_widths(y, p, 0.5)],
        "w10": [a.tolist() for a in signal.peak_widths(y, p, 1.0)],
    }
    y = np.array([0, 2, 1, 5, 1, 3, 0], dtype=float)
    out["prominences"] = signal.peak_prominences(y, [1, 3, 5])[0].tolist()
    y = np.array([0, 5, 0, 4, 0, 6, 0], dtype=float)
    out["distance3"] = signal.find_peaks(y, distance=3)[0].tolist()
    out["distance2"] = signal.find_peaks(y, distance=2)[0].tolist()
    out["plateau5"] = signal.find_peaks(np.array([0, 1, 1, 1, 0.0]))[0].tolist()
    out["plateau4"] = signal.find_peaks(np.array([0, 1, 1, 0.0]))[0].tolist()
    return out


def main():
    traces = make_traces()
    data = {
        "generator": "test/reference/make_peaks.py",
        "scipy": scipy.__version__,
        "numpy": np.__version__,
        "small": small_examples(),
        "traces": [describe(k, v) for k, v in traces.items()],
    }
    path = pathlib.Path(__file__).with_name("peaks.json")
    path.write_text(json.dumps(data))
    print(f"wrote {path} (SciPy {scipy.__version__}, NumPy {np.__version__})")
    for t in data["traces"]:
        print(t["name"], len(t["maxima"]), "maxima;", len(t["findPeaksProminenceDistance"]),
              "with prominence+distance; tie-free:", t["distanceTieFree"])


if __name__ == "__main__":
    main()
