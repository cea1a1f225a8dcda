"""How many rows does pure white noise give in the peak table? An independent
simulation of the stated rules, for test/core/measure/noise-bumps.test.ts.

The rules are those written in src/core/measure/peak-bounds.ts (rules 1-6)
and peak-table.ts (thresholds), re-implemented here in Python from their text
for the default settings: sigma = 1 (white, known), smallest prominence 2
sigma, smallest S/N 2, smallest half-height width 2.5 samples, S/N = H/sigma,
limits 3 and 10, perpendicular drop. The noise comes from NumPy's generator
(PCG64), not from the project's; local maxima, prominences and half-prominence
widths from SciPy (scipy.signal), which the TypeScript reproduces exactly.

Writes test/reference/noise-bumps.json: points simulated, rows at or above
S/N 3 and 10, the rate per point, the largest S/N.

Run:  python3 test/reference/noise_bumps.py   (a few minutes)
"""
import json
import math
import pathlib

import numpy as np
import scipy
from scipy import signal

WIDTH_LIMIT = 8          # bounds at most 8 own half-height half-widths from the apex
VALLEY_RISE = 3          # rise (sigma_B) that ends a walk at a valley
VALLEY_RISE_AFTER = 6    # the same once back at the baseline
RETURN_ABOVE_HULL = 3    # back at the baseline within this many sigma_B above the reference
RETURN_BEYOND = 2        # bound this many half-widths beyond the return
LEVEL_POINTS_MIN = 5     # level: mean of at least 5 samples beyond a bound
MAX_PASSES = 2
FLANK_RIDER_NARROWER = 10  # a bump on a flank rides only when this many times narrower (and sharing a valley
                           # would cut off more of the neighbour than the bump holds)
APEX_HALF_WINDOW_MAX = 50
LOC_MIN_WIDTH = 2         # rule 2b: narrower features keep their own crossings for the bounds walk
SAME_TOP_SHARE = 0.25     # rule 6b: two maxima whose apexes lie this share of the narrower width apart are one top
MIN_PROM, MIN_SNR, MIN_WIDTH, DL, QL = 2.0, 2.0, 2.5, 3.0, 10.0
SIGMA = 1.0


def clamp(k, n):
    return 0 if k < 0 else (n - 1 if k >= n else k)


def box_mean(s, i, r):
    n = len(s)
    return sum(s[clamp(k, n)] for k in range(i - r, i + r + 1)) / (2 * r + 1)


def line_through(xa, ya, xb, yb):
    if xb == xa:
        return (xa, (ya + yb) / 2, 0.0)
    return (xa, ya, (yb - ya) / (xb - xa))


def at(line, x):
    return line[1] + line[2] * (x - line[0])


def foot_at_scale(s, i, d, r, rise, cap):
    n = len(s)
    B = 2 * r + 1
    total = sum(s[clamp(k, n)] for k in range(i - r, i + r + 1))
    mn, a = total / B, i
    j = i
    for _ in range(cap):
        nxt = j + d
        if nxt < 0 or nxt >= n:
            break
        total += s[clamp(nxt + d * r, n)] - s[clamp(j - d * r, n)]
        j = nxt
        v = total / B
        if v < mn:
            mn, a = v, j
        elif v > mn + rise:
            break
    return a, mn


def box_top(s, i, r, h):
    """The sample within +-h of i where the box average is highest (the first of equals)."""
    lo, hi = max(0, i - h), min(len(s) - 1, i + h)
    best, v = lo, -math.inf
    for j in range(lo, hi + 1):
        g = box_mean(s, j, r)
        if g > v:
            best, v = j, g
    return best


def first_feet(s, i, width_limit, cap):
    """Rule 1: box sizes 1, 3, 5, 9, 17, ... up to 3/4 of the half-prominence width (at least 3; where a walk ends
    where it starts, both walk again from the highest box average within half that width); keep the best z
    (every size is tried)."""
    best, best_z = (0, i, s[i], i, s[i]), -math.inf
    r = 0
    while True:
        B = 2 * r + 1
        if r > 0 and B > max(3, 0.75 * width_limit):
            break
        sb = SIGMA / math.sqrt(B)
        top = i
        f0, l0 = foot_at_scale(s, top, -1, r, VALLEY_RISE * sb, cap)
        f1, l1 = foot_at_scale(s, top, 1, r, VALLEY_RISE * sb, cap)
        if r > 0 and (f0 == i or f1 == i):
            top = box_top(s, i, r, math.ceil(width_limit / 2))
            f0, l0 = foot_at_scale(s, top, -1, r, VALLEY_RISE * sb, cap)
            f1, l1 = foot_at_scale(s, top, 1, r, VALLEY_RISE * sb, cap)
        base = (l0 + l1) / 2 if f1 == f0 else l0 + (l1 - l0) * (top - f0) / (f1 - f0)
        z = (box_mean(s, top, r) - base) / sb
        if z > best_z:
            best, best_z = (r, f0, l0, f1, l1), z
        r = 1 if r == 0 else 2 * r
    return best


def quad_fit_value(s, line, i0, i1, xc, at_x):
    """Least-squares parabola through samples i0..i1 of s - line, evaluated at at_x (x = index here)."""
    ts = np.arange(i0, i1 + 1, dtype=float)
    vs = np.array([s[k] - at(line, k) for k in range(i0, i1 + 1)])
    span = max(i1 - xc, xc - i0)
    t = (ts - xc) / span
    A = np.vstack([np.ones_like(t), t, t * t]).T
    c, *_ = np.linalg.lstsq(A, vs, rcond=None)
    u = (at_x - xc) / span
    return c[0] + c[1] * u + c[2] * u * u, c


def apex_position(s, line, i, fw):
    """Vertex of the parabola through the 3 top samples above the line; for own widths >= 6 a window of
    +-fw/3 samples weighted by cell overlap, re-centred up to 5 times (x = index, unit spacing)."""
    n = len(s)
    if i <= 0 or i >= n - 1:
        return float(i)
    v0, v1, v2 = s[i - 1] - at(line, i - 1), s[i] - at(line, i), s[i + 1] - at(line, i + 1)
    d1, d2 = v1 - v0, v2 - v1
    a = (d2 - d1) / 2
    start = float(i) if not a < 0 else min(i + 1.0, max(i - 1.0, (2 * i - 1) / 2 - d1 / (2 * a)))
    if fw < 6:
        return start
    q = math.floor(fw / 3)
    half = q  # (x[i+1] - x[i-1]) / 2 = 1
    lim0, lim1 = max(0, i - q), min(n - 1, i + q)
    v = start
    for _ in range(5):
        lo, hi = v - half, v + half
        i0, i1 = i, i
        while i0 > 0 and (2 * i0 - 1) / 2 > lo:
            i0 -= 1
        while i1 < n - 1 and (2 * i1 + 1) / 2 < hi:
            i1 += 1
        span = max(i1 - v, v - i0)
        if not span > 0:
            return start
        w, t, y = [], [], []
        for k in range(i0, i1 + 1):
            aa = (k - 0.5) if k > 0 else k
            bb = (k + 0.5) if k < n - 1 else k
            wk = max(0.0, min(bb, hi) - max(aa, lo)) / ((bb - aa) or 1)
            if wk == 0:
                continue
            w.append(wk); t.append((k - v) / span); y.append(s[k] - at(line, k))
        w, t, y = np.array(w), np.array(t), np.array(y)
        # Each sample weighted by the part of its cell inside the window (normal equations weighted by w).
        W = np.diag(w)
        M = np.vstack([np.ones_like(t), t, t * t]).T
        c = np.linalg.solve(M.T @ W @ M, M.T @ W @ y)
        if not c[2] < 0:
            return start
        nv = min(lim1, max(lim0, v - c[1] * span / (2 * c[2])))
        moved = abs(nv - v)
        v = nv
        if moved < 1e-9 * half:
            break
    return v


def apex_level(s, line, i, fw, at_x):
    n = len(s)
    q = max(1, min(APEX_HALF_WINDOW_MAX, math.floor(fw / 6)))
    if q == 1 and 0 < i < n - 1:
        v0, v1, v2 = s[i - 1] - at(line, i - 1), s[i] - at(line, i), s[i + 1] - at(line, i + 1)
        d1, d2 = v1 - v0, v2 - v1
        a = (d2 - d1) / 2
        return v1 + d1 * (at_x - i) + a * (at_x - (i - 1)) * (at_x - i)
    c = i if q == 1 else int(round(at_x))
    i0, i1 = max(0, c - q), min(n - 1, c + q)
    own = s[i] - at(line, i)
    if i1 - i0 < 2:
        return own
    val, _ = quad_fit_value(s, line, i0, i1, c, at_x)
    return val


def crossings(s, line, i, half, lo, hi):
    d = lambda k: s[k] - at(line, k)
    j = i
    while lo < j and half < d(j):
        j -= 1
    lip = float(j)
    if d(j) < half and j < i:
        lip += (half - d(j)) / (d(j + 1) - d(j))
    j = i
    while j < hi and half < d(j):
        j += 1
    rip = float(j)
    if d(j) < half and j > i:
        rip -= (half - d(j)) / (d(j - 1) - d(j))
    return lip, rip


def hull_under(s, i, lo, hi, r):
    n = len(s)
    g = [box_mean(s, j, r) for j in range(lo, hi + 1)]
    st = []
    for j in range(lo, hi + 1):
        gj = g[j - lo]
        while len(st) >= 2:
            a, b = st[-2], st[-1]
            cross = (b - a) * (gj - g[a - lo]) - (g[b - lo] - g[a - lo]) * (j - a)
            if cross > 0:
                break
            st.pop()
        st.append(j)
    if len(st) == 1:
        return (st[0], g[st[0] - lo], 0.0)
    k = 0
    while k < len(st) - 2 and st[k + 1] < i:
        k += 1
    a, b = st[k], st[k + 1]
    return line_through(a, g[a - lo], b, g[b - lo])


def walk_bound(s, i, d, ref, hull, r, sb, cap, start_from, beyond):
    n = len(s)
    B = 2 * r + 1
    j = i + d
    if j < 0 or j >= n:
        return i, 'trace-end'
    total = sum(s[clamp(k, n)] for k in range(j - r, j + r + 1))
    mn, arg, returned = math.inf, j, -1
    while True:
        g = total / B
        lr = at(ref, j)
        v = g - lr
        dist = abs(j - i)
        if dist >= start_from:
            if v < mn:
                mn, arg = v, j
            elif v > mn + (VALLEY_RISE_AFTER if returned >= 0 else VALLEY_RISE) * sb:
                return arg, 'valley'
        if returned < 0 and dist >= start_from and g - min(lr, at(hull, j)) <= RETURN_ABOVE_HULL * sb:
            returned = j
        if returned >= 0 and abs(j - returned) >= beyond:
            return j, 'returned'
        if dist >= cap:
            return j, ('returned' if returned >= 0 else 'width-limit')
        nxt = j + d
        if nxt < 0 or nxt >= n:
            return j, 'trace-end'
        total += s[clamp(nxt + d * r, n)] - s[clamp(j - d * r, n)]
        j = nxt


def level(s, b, d, kind, r):
    n = len(s)
    if kind in ('valley', 'shared-valley'):
        return float(b), box_mean(s, b, r)
    want = max(2 * r + 1, LEVEL_POINTS_MIN)
    half = want // 2
    xs, ys, near, far = [], [], [], []
    for k in range(want):
        j = b + d * k
        if j < 0 or j >= n:
            break
        xs.append(j); ys.append(s[j])
        (near if k < half else far).append(s[j])
    if len(xs) < 3 or (np.mean(far) - np.mean(near) > 2 * SIGMA * math.sqrt(1 / len(near) + 1 / len(far))):
        return float(b), box_mean(s, b, r)
    return float(np.mean(xs)), float(np.mean(ys))


class M:
    pass


LOC = []  # the 3-point average of the trace being measured (rule 2b), set by table()


def locating_copy(s):
    """3-point centred average, the ends the 2-point average (locatingCopy in peak-bounds.ts)."""
    n = len(s)
    out = [(s[0] + s[1]) / 2] + [(s[k - 1] + s[k] + s[k + 1]) / 3 for k in range(1, n - 1)] + [(s[n - 2] + s[n - 1]) / 2]
    return out


def loc_crossings(m):
    """Rule 2b: the bounds walk's half-widths from the half-height crossings of the 3-point average, at half its own
    top (its highest sample within the raw crossings, one sample either side), never inside the raw crossings; raw on
    a side where the copy rises above its top first, and for a feature under LOC_MIN_WIDTH samples."""
    m.loc_l, m.loc_r = m.lip, m.rip
    if m.rip - m.lip < LOC_MIN_WIDTH:
        return
    loc, l = LOC, m.line
    a, b = max(m.start, math.floor(m.lip) - 1), min(m.end, math.ceil(m.rip) + 1)
    top, v = m.i, loc[m.i] - at(l, m.i)
    for j in range(a, b + 1):
        w = loc[j] - at(l, j)
        if w > v:
            top, v = j, w
    if not v > 0:
        return
    cl, cr = crossings(loc, l, top, v / 2, m.start, m.end)
    if any(loc[j] - at(l, j) > v for j in range(top - 1, math.floor(cl), -1) if j > cl):
        cl = m.lip
    if any(loc[j] - at(l, j) > v for j in range(top + 1, math.ceil(cr)) if j < cr):
        cr = m.rip
    m.loc_l, m.loc_r = min(cl, m.lip), max(cr, m.rip)


def shape(s, m, fw_guess):
    h0 = apex_level(s, m.line, m.i, fw_guess, m.xa)
    if h0 > 0:
        m.lip, m.rip = crossings(s, m.line, m.i, h0 / 2, m.start, m.end)
        loc_crossings(m)
    else:
        m.lip = m.rip = float(m.i)
        m.loc_l = m.loc_r = float(m.i)
    fw = m.rip - m.lip
    m.xa = apex_position(s, m.line, m.i, fw)
    m.h = apex_level(s, m.line, m.i, fw, m.xa)
    return fw


def rewalk(s, m, left, right):
    n = len(s)
    i = m.i
    hl, hr = max(i - m.loc_l, 0.5), max(m.loc_r - i, 0.5)
    r = math.floor((hl + hr) / 4)
    sb = SIGMA / math.sqrt(2 * r + 1)
    capl, capr = max(2, math.ceil(WIDTH_LIMIT * hl)), max(2, math.ceil(WIDTH_LIMIT * hr))
    hull = hull_under(s, i, max(0, i - capl), min(n - 1, i + capr), r)
    moved = False
    if left:
        b, k = walk_bound(s, i, -1, m.line, hull, r, sb, capl, min(capl, math.ceil(hl)), max(2 * r + 1, math.ceil(RETURN_BEYOND * hl)))
        moved = moved or b != m.start or k != m.sk
        m.start, m.sk = b, k
    if right:
        b, k = walk_bound(s, i, 1, m.line, hull, r, sb, capr, min(capr, math.ceil(hr)), max(2 * r + 1, math.ceil(RETURN_BEYOND * hr)))
        moved = moved or b != m.end or k != m.ek
        m.end, m.ek = b, k
    m.box = r
    return moved


def measure_local(s, i, wp):
    fl = max(1.0, wp)
    r0, f0, l0, f1, l1 = first_feet(s, i, fl, max(2, math.ceil(WIDTH_LIMIT * max(1.0, wp))))
    m = M()
    m.i, m.xa, m.h, m.lip, m.rip = i, float(i), 0.0, float(i), float(i)
    m.loc_l, m.loc_r = float(i), float(i)
    m.start, m.end, m.sk, m.ek = f0, f1, 'valley', 'valley'
    m.line, m.box, m.split = line_through(f0, l0, f1, l1), r0, 'none'
    fw = shape(s, m, 2 * r0 + 1)
    for _ in range(MAX_PASSES):
        if not m.h > 0:
            return m
        moved = rewalk(s, m, True, True)
        xa, ya = level(s, m.start, -1, m.sk, m.box)
        xb, yb = level(s, m.end, 1, m.ek, m.box)
        m.line = line_through(xa, ya, xb, yb)
        fw = shape(s, m, fw)
        if not moved:
            break
    return m


def touching(A, B):
    near = A.ek == 'valley' and B.sk == 'valley' and B.start - A.end <= 2 * max(A.box, B.box) + 1
    return A.end >= B.start or near


def valley_between(s, a, b, r, under):
    if b - a < 2:
        return a + 1 if a + 1 <= b else a
    best, v = a + 1, math.inf
    for j in range(a + 1, b):
        g = box_mean(s, j, r) - at(under, j)
        if g < v:
            v, best = g, j
    if (best == a + 1 or best == b - 1) and r > 0:
        w = math.inf
        for j in range(a + 1, b):
            g = s[j] - at(under, j)
            if g < w:
                w, best = g, j
    return best


def shared_valley(s, A, B):
    r = min(A.box, B.box) >> 1
    under = line_through(A.start, at(A.line, A.start), B.end, at(B.line, B.end))
    return valley_between(s, A.i, B.i, r, under)


def area_above(s, line, i0, i1):
    """Area of s - line between samples i0 and i1 (trapezoid rule, x = sample index)."""
    a = 0.0
    prev = s[i0] - at(line, i0)
    for i in range(i0, i1):
        nxt = s[i + 1] - at(line, i + 1)
        a += 0.5 * (prev + nxt)
        prev = nxt
    return a


def riders(s, ms):
    """Rule 6a: narrower than half a higher neighbour, and on its top (within its half-height crossings) or
    within its bounds when also under a tenth of its width and a split at the bump would cut off more of the
    neighbour than the bump holds: the bump's own area (above its own line between its bounds, at least 0) is
    less than the neighbour's area above the neighbour's line from the bump's near bound out to the
    neighbour's bound on that side, less the bump's own. Of several hosts the highest."""
    out = [-1] * len(ms)
    fwo = lambda m: m.rip - m.lip
    # Only peaks whose bounds reach B's apex can host it: scan outward while some peak further out still reaches.
    reach_r, reach_l, v = [0] * len(ms), [0] * len(ms), -math.inf
    for k, m in enumerate(ms):
        v = max(v, m.end)
        reach_r[k] = v
    v = math.inf
    for k in range(len(ms) - 1, -1, -1):
        v = min(v, ms[k].start)
        reach_l[k] = v
    for k, B in enumerate(ms):
        host = -1
        near = []
        j = k - 1
        while j >= 0 and reach_r[j] >= B.i:
            near.append(j)
            j -= 1
        j = k + 1
        while j < len(ms) and reach_l[j] <= B.i:
            near.append(j)
            j += 1
        for j in near:
            A = ms[j]
            if not (A.start <= B.i <= A.end):
                continue
            if not (fwo(B) < fwo(A) / 2 and B.h < A.h and (host < 0 or ms[host].h < A.h)):
                continue
            if A.lip <= B.i <= A.rip:
                host = j
                continue
            if not fwo(B) < fwo(A) / FLANK_RIDER_NARROWER:
                continue
            own = max(0.0, area_above(s, B.line, B.start, B.end))
            if B.i > A.i:
                cut = area_above(s, A.line, max(A.i, B.start), A.end)
            else:
                cut = area_above(s, A.line, A.start, min(A.i, B.end))
            if own < cut - own:
                host = j
        out[k] = host
    return out


def merge_shallow(s, ms):
    out = list(ms)
    k = 0
    while k + 1 < len(out):
        A, B = out[k], out[k + 1]
        if not touching(A, B):
            k += 1
            continue
        v = shared_valley(s, A, B)
        # Two maxima of one top: apexes within a quarter of the narrower half-height width (x is the sample index);
        # then the one of smaller prominence goes, otherwise the lower one is tested.
        same_top = abs(A.xa - B.xa) <= SAME_TOP_SHARE * min(A.rip - A.lip, B.rip - B.lip)
        if same_top and A.prom != B.prom:
            lower = k if A.prom < B.prom else k + 1
        else:
            lower = k if A.h <= B.h else k + 1
        m = out[lower]
        rise = (box_mean(s, m.i, m.box) - box_mean(s, v, m.box)) / (SIGMA / math.sqrt(2 * m.box + 1))
        if same_top or rise < DL:
            out.pop(lower)
            k = max(0, k - 1)
        else:
            k += 1
    return out


def side_cap(m, d):
    hw = m.i - m.lip if d < 0 else m.rip - m.i
    return max(2, math.ceil(WIDTH_LIMIT * max(hw, 0.5)))


def clamp_once(s, m):
    cl, cr = side_cap(m, -1), side_cap(m, 1)
    now = False
    if m.i - m.start > cl:
        m.start, m.sk, now = max(0, m.i - cl), 'width-limit', True
    if m.end - m.i > cr:
        m.end, m.ek, now = min(len(s) - 1, m.i + cr), 'width-limit', True
    return now


def own_line(s, m):
    xa, ya = level(s, m.start, -1, m.sk, m.box)
    xb, yb = level(s, m.end, 1, m.ek, m.box)
    m.line = line_through(xa, ya, xb, yb)
    shape(s, m, m.rip - m.lip)


def clamp_to_cap(s, m):
    moved = False
    for _ in range(4):
        if not clamp_once(s, m):
            break
        moved = True
        if m.split == 'perpendicular-drop':
            break
        own_line(s, m)
    return moved


def cap_bounds(s, m):
    """The width limit, last (capBounds in peak-bounds.ts): bounds pulled in to 8 final half-widths; own lines
    again; a group member with no area above the group's line gets its own valley-to-valley line."""
    moved = clamp_to_cap(s, m)
    if m.split == 'perpendicular-drop' and (moved or m.h > 0) and not area_above(s, m.line, m.start, m.end) > 0:
        m.split = 'valley-to-valley'
        own_line(s, m)
        moved = clamp_to_cap(s, m)
    if moved:
        clamp_once(s, m)


def share_valleys(s, ms, grouped):
    changed = [False] * len(ms)
    for k in range(len(ms) - 1):
        A, B = ms[k], ms[k + 1]
        if not touching(A, B):
            continue
        v = shared_valley(s, A, B)
        kind = 'shared-valley' if grouped[k] or grouped[k + 1] else 'valley'
        A.end, A.ek, B.start, B.sk = v, kind, v, kind
        changed[k] = changed[k + 1] = True
    lev = lambda m, side: level(s, m.start, -1, m.sk, m.box) if side < 0 else level(s, m.end, 1, m.ek, m.box)
    k = 0
    while k < len(ms):
        e = k
        while e + 1 < len(ms) and ms[e].ek == 'shared-valley':
            e += 1
        if e > k:
            first, last = ms[k], ms[e]
            for _ in range(MAX_PASSES):
                (xa, ya), (xb, yb) = lev(first, -1), lev(last, 1)
                line = line_through(xa, ya, xb, yb)
                for j in range(k, e + 1):
                    m = ms[j]
                    m.split = 'perpendicular-drop'
                    m.line = line
                    shape(s, m, m.rip - m.lip)
                    changed[j] = False
                ml = first.h > 0 and rewalk(s, first, True, False)
                mr = last.h > 0 and rewalk(s, last, False, True)
                if not ml and not mr:
                    break
        for j in range(k, e + 1):
            m = ms[j]
            if changed[j]:
                (xa, ya), (xb, yb) = lev(m, -1), lev(m, 1)
                m.line = line_through(xa, ya, xb, yb)
                shape(s, m, m.rip - m.lip)
            if not m.h > 0 and m.split == 'perpendicular-drop':
                (xa, ya), (xb, yb) = lev(m, -1), lev(m, 1)
                m.line = line_through(xa, ya, xb, yb)
                m.split = 'valley-to-valley'
                shape(s, m, m.rip - m.lip)
        k = e + 1


def table(s):
    """The rows' S/N for white noise s (x = sample index, sigma = 1), default settings."""
    global LOC
    LOC = locating_copy(s)
    peaks, _ = signal.find_peaks(s)
    prom, lb, rb = signal.peak_prominences(s, peaks)
    keep = prom >= MIN_PROM
    peaks, prom, lb, rb = peaks[keep], prom[keep], lb[keep], rb[keep]
    widths = signal.peak_widths(s, peaks, rel_height=0.5, prominence_data=(prom, lb, rb))[0]
    cands = []
    for i, wp, pr in zip(peaks, widths, prom):
        m = measure_local(s, int(i), float(wp))
        m.prom = float(pr)
        if not m.h > 0:
            continue
        if m.rip - m.lip < MIN_WIDTH:
            continue
        if m.h / SIGMA < MIN_SNR:
            continue
        cands.append(m)
    rid = riders(s, cands)
    free = [m for m, h in zip(cands, rid) if h < 0]
    free = merge_shallow(s, free)
    share_valleys(s, free, [m.h / SIGMA >= DL for m in free])
    rows = free + [m for m, h in zip(cands, rid) if h >= 0]
    out = []
    for m in rows:
        cap_bounds(s, m)
        if not m.h > 0:
            continue
        snr = m.h / SIGMA
        if snr < MIN_SNR or (m.rip - m.lip) < MIN_WIDTH:
            continue
        if not area_above(s, m.line, m.start, m.end) > 0:  # a bump with no area above its own line is no peak
            continue
        out.append(snr)
    return out


def main():
    rng = np.random.default_rng(20261202)
    chunk, chunks = 1 << 17, 16
    dl = ql = 0
    largest = 0.0
    for c in range(chunks):
        s = rng.standard_normal(chunk).tolist()
        snrs = table(s)
        dl += sum(1 for v in snrs if v >= DL)
        ql += sum(1 for v in snrs if v >= QL)
        largest = max([largest] + snrs)
        print(f"chunk {c + 1}/{chunks}: {dl} rows at S/N >= 3 so far", flush=True)
    pts = chunk * chunks
    out = {
        "scipy": scipy.__version__, "numpy": np.__version__, "generator": "numpy default_rng(20261202), PCG64",
        "settings": "sigma 1 known, white; prominence >= 2, S/N >= 2, half-height width >= 2.5 samples, S/N = H/sigma, limits 3 and 10, perpendicular drop",
        "points": pts, "rows_at_or_above_3": dl, "rows_at_or_above_10": ql,
        "rate_at_or_above_3_per_point": dl / pts, "largest_snr": largest,
    }
    path = pathlib.Path(__file__).with_name("noise-bumps.json")
    path.write_text(json.dumps(out, indent=1) + "\n")
    print("wrote", path, out)


if __name__ == "__main__":
    main()
