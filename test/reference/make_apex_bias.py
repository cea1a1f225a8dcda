#!/usr/bin/env python3
"""How high does the apex level of a narrow noisy peak read, by the rule
alone? An independent simulation for test/core/measure/peak-broad.test.ts and
DEVELOPERS.md ("Broad peaks in noise", issue 14).

The rule as stated in src/core/measure/peak-bounds.ts (apexLevel): on a peak
whose own half-height width is under 12 samples the apex level is the
parabola through the three samples around the apex sample, read at the
apex position (apexPosition: from 6 samples of width on, the vertex of a
least-squares parabola over ±FWHM/3, re-centred; below, the three-point
vertex); the apex sample is the local maximum the detector lists, i.e. the
highest noisy sample on the top. Here the baseline is known (0) and the
noise is white (σ = 1), so what is measured is the rule's own bias: the
noise chooses the apex sample (the largest of several nearly equal noisy
samples) and the parabola keeps most of that sample's noise.

Cases: Gaussians centred on a sample (as in test/core/measure/broad.ts) of
σ = 3 samples at S/N 10, 20 and 100, and for comparison σ = 10 samples at
S/N 10 read by the same three-point rule (our rule uses a least-squares
parabola over ±FWHM/6 there, so that row is not our rule, only the size of
the selection bias). Also the noiseless bias of a least-squares parabola
over ±2 samples on σ = 3 (a wider fit trades the noise bias for a shape
bias).

Noise: NumPy default_rng(20261203), PCG64; 400,000 realisations per case.
Writes test/reference/apex-bias.json with the SciPy and NumPy versions.

Run:  python3 test/reference/make_apex_bias.py   (a few seconds)
"""
import json
import pathlib

import numpy as np
import scipy

N = 400_000


def three_point_vertex_level(v0, v1, v2):
    """Level at the vertex of the parabola through (-1, v0), (0, v1), (1, v2); v1 where it does not open downward."""
    a = (v0 + v2) / 2 - v1
    b = (v2 - v0) / 2
    with np.errstate(divide="ignore", invalid="ignore"):
        t = np.where(a < 0, -b / (2 * a), 0.0)
    t = np.clip(t, -1, 1)
    return np.where(a < 0, v1 + b * t + a * t * t, v1)


def ls_vertex(y, rows, j, q, iterations=5):
    """Our position rule (apexPosition) for a half-height width of 3q to 3q + 2 samples: the vertex of a
    least-squares parabola over the window +-q samples about the current estimate, each sample weighted by the
    part of its cell inside the window, re-centred up to 5 times, kept within +-q of the apex sample; starting
    from the three-point vertex. Offsets from the apex sample."""
    a = (y[rows, j - 1] + y[rows, j + 1]) / 2 - y[rows, j]
    b = (y[rows, j + 1] - y[rows, j - 1]) / 2
    with np.errstate(divide="ignore", invalid="ignore"):
        v = np.where(a < 0, np.clip(-b / (2 * a), -1, 1), 0.0)
    offs = np.arange(-2 * q - 1, 2 * q + 2)
    vals = np.stack([y[rows, j + o] for o in offs], axis=1)
    for _ in range(iterations):
        lo, hi = v - q, v + q
        w = np.clip(np.minimum(offs[None, :] + 0.5, hi[:, None]) - np.maximum(offs[None, :] - 0.5, lo[:, None]), 0, 1)
        t = offs[None, :] - v[:, None]
        S = [np.sum(w * t ** p, axis=1) for p in range(5)]
        Y = [np.sum(w * vals * t ** p, axis=1) for p in range(3)]
        M = np.stack([np.stack([S[0], S[1], S[2]], -1), np.stack([S[1], S[2], S[3]], -1), np.stack([S[2], S[3], S[4]], -1)], -2)
        c = np.linalg.solve(M, np.stack(Y, -1)[..., None])[..., 0]
        ok = c[:, 2] < 0
        with np.errstate(divide="ignore", invalid="ignore"):
            nv = np.where(ok, v - c[:, 1] / (2 * c[:, 2]), v)
        v = np.clip(nv, -q, q)
    return v


def three_point_level_at(v0, v1, v2, t):
    """The parabola through (-1, v0), (0, v1), (1, v2) read at t (Newton form, as apexLevel)."""
    return v1 + (v2 - v0) / 2 * t + ((v0 + v2) / 2 - v1) * t * t


def case(rng, sigma, snr):
    half = int(np.ceil(1.1774 * sigma))  # the samples within the half-height width
    q = int(np.floor(2.3548 * sigma / 3))  # position window of our rule for the true half-height width
    pad = half + 2 * q + 3
    k = np.arange(-pad, pad + 1)
    clean = snr * np.exp(-0.5 * (k / sigma) ** 2)
    y = clean[None, :] + rng.standard_normal((N, k.size))
    inner = y[:, pad - half:pad + half + 1]
    j = np.argmax(inner, axis=1) + pad - half  # highest noisy sample on the top (index into y)
    rows = np.arange(N)
    v0, v1, v2 = y[rows, j - 1], y[rows, j], y[rows, j + 1]
    lev = three_point_vertex_level(v0, v1, v2)
    out = {
        "sigma_samples": sigma, "snr": snr,
        "mean_relative_bias": float(np.mean(lev) / snr - 1),
        "standard_error": float(np.std(lev) / snr / np.sqrt(N)),
        "apex_sample_not_centre_share": float(np.mean(j != pad)),
    }
    if sigma == 3:
        # Our position rule applies (the three-point level is read within a sample or two of its centre).
        ours = three_point_level_at(v0, v1, v2, ls_vertex(y, rows, j, q))
        out["position_window_half_samples"] = q
        out["mean_relative_bias_read_at_ls_position"] = float(np.mean(ours) / snr - 1)
        out["standard_error_read_at_ls_position"] = float(np.std(ours) / snr / np.sqrt(N))
    return out


def lsq5_noiseless(sigma):
    """Value at 0 of the least-squares parabola through a unit Gaussian's samples at -2..2, minus 1."""
    t = np.arange(-2, 3, dtype=float)
    v = np.exp(-0.5 * (t / sigma) ** 2)
    c = np.polyfit(t, v, 2)
    return float(np.polyval(c, 0.0) - 1)


def main():
    rng = np.random.default_rng(20261203)
    cases = [case(rng, 3, 10), case(rng, 3, 20), case(rng, 3, 100), case(rng, 10, 10)]
    out = {
        "scipy": scipy.__version__, "numpy": np.__version__, "generator": "numpy default_rng(20261203), PCG64",
        "realisations": N,
        "rule": "apex level = parabola through the highest noisy sample on the top and its two neighbours, read at its vertex (mean_relative_bias) or, as our rule does for half-height widths of 6 samples or more, at the vertex of a least-squares parabola over +-FWHM/3 (mean_relative_bias_read_at_ls_position); baseline known (0), white noise sigma 1",
        "cases": cases,
        "lsq5_noiseless_bias_sigma3": lsq5_noiseless(3),
    }
    path = pathlib.Path(__file__).with_name("apex-bias.json")
    path.write_text(json.dumps(out, indent=1) + "\n")
    print("wrote", path, json.dumps(out, indent=1))


if __name__ == "__main__":
    main()
