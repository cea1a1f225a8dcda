/**
 * Peak shapes for region fitting, each with analytic derivatives with respect
 * to its parameters, and the figures a chemist reads off a fitted peak
 * (apex position, height, full width at half maximum, area) as functions of
 * those parameters, with their gradients for standard errors.
 *
 * Parameters (x-units for positions and widths, signal units for heights):
 * * gaussian      [position, height, fwhm]            h·exp(−4 ln2 (x−c)²/w²)
 * * lorentzian    [position, height, fwhm]            h / (1 + 4 (x−c)²/w²)
 * * pseudo-voigt  [position, height, fwhm, eta]       h·(η·L + (1−η)·G), L and G of the same
 *                 FWHM and unit height (Wertheim et al. 1974, J. Electron Spectrosc. 3:69); 0 ≤ η ≤ 1
 * * emg           [mu, area, sigma, tau]              area × the exponentially modified Gaussian
 *                 density (Grushka 1972, Anal. Chem. 44:1733): a Gaussian (mu, sigma) convolved
 *                 with a one-sided exponential of time constant tau (the same density as SciPy's
 *                 `stats.exponnorm` with K = tau/sigma, loc = mu, scale = sigma).
 *
 * The EMG is evaluated in a form that neither overflows nor cancels:
 * g = (1/2τ)·exp(−u²/2)·erfcx(z) for z ≥ 0 and g = (1/2τ)·exp(σ²/2τ² − (x−μ)/τ)·erfc(z) for
 * z < 0, with u = (x−μ)/σ and z = (σ/τ − u)/√2 (Kalambet et al. 2011, J. Chemometrics 25:352,
 * discuss the same overflow).
 */
import { erfc, erfcx } from '../../numeric/erf.ts';

export type ShapeKind = 'gaussian' | 'lorentzian' | 'pseudo-voigt' | 'emg';

export const SHAPE_KINDS: readonly ShapeKind[] = ['gaussian', 'lorentzian', 'pseudo-voigt', 'emg'];

/** The four figures of a fitted peak, in x-units and signal units (area: signal × x-units). */
export interface PeakFigures {
  position: number;
  height: number;
  fwhm: number;
  area: number;
}

export const FIGURE_NAMES = ['position', 'height', 'fwhm', 'area'] as const;
export type FigureName = (typeof FIGURE_NAMES)[number];

/** Box bounds for one peak's parameters, built from the region and the smallest allowed width. */
export interface ShapeBoundsInput {
  /** Region start and end, x-units. */
  from: number;
  to: number;
  /** Smallest full width at half maximum any component may take, x-units. */
  minFwhm: number;
  /** Largest full width at half maximum, x-units (the region's span: anything wider is baseline). */
  maxFwhm: number;
}

export interface ShapeModel {
  kind: ShapeKind;
  /** Plain words for tables and reports. */
  label: string;
  /** Parameter names in order, e.g. ['position', 'height', 'fwhm']. */
  paramNames: readonly string[];
  /**
   * Add this peak to `out` over `x`; when `jac` is given, write the derivative
   * with respect to parameter j into column `col + j` (column-major, n rows).
   */
  evaluate(x: Float64Array, p: ArrayLike<number>, offset: number, out: Float64Array, jac: Float64Array | null, col: number): void;
  /** The peak's figures from its parameters. */
  figures(p: ArrayLike<number>, offset: number): PeakFigures;
  /** ∂figure/∂parameter, one row per figure in FIGURE_NAMES order. */
  figureGradient(p: ArrayLike<number>, offset: number): number[][];
  /** Parameters from a rough position, height above baseline and FWHM. */
  start(position: number, height: number, fwhm: number): number[];
  lower(b: ShapeBoundsInput): number[];
  upper(b: ShapeBoundsInput): number[];
  /** Indices of parameters that are widths (their lower bound is the minimum width). */
  widthParams: readonly number[];
  /** Index of the parameter that keeps the peak positive (height or area). */
  sizeParam: number;
  /** Index of the position-like parameter (bounded by the region). */
  positionParam: number;
}

const FOUR_LN2 = 4 * Math.LN2;
const EIGHT_LN2 = 8 * Math.LN2;
/** Area of a unit-height Gaussian per unit FWHM: √(π / (4 ln 2)) = 1.0644670. */
const GAUSS_AREA = Math.sqrt(Math.PI / FOUR_LN2);
/** Area of a unit-height Lorentzian per unit FWHM: π/2. */
const LORENTZ_AREA = Math.PI / 2;
const FWHM_PER_SIGMA = 2 * Math.sqrt(2 * Math.LN2);
const SQRT2 = Math.SQRT2;
const SQRT_2PI = Math.sqrt(2 * Math.PI);

/**
 * A symmetric unit-height shape u(q) of q = k·(x − c)²/w² with u(0) = 1 and
 * u(k/4) = 1/2 (so w is the FWHM), and −du/dq written through u itself.
 */
interface SymmetricUnit {
  kind: ShapeKind;
  label: string;
  /** k in q = k (x − c)² / w². */
  k: number;
  /** Area of the unit-height shape per unit FWHM. */
  area: number;
  value(q: number): number;
  /** −du/dq as a function of u (Gaussian: u; Lorentzian: u²). */
  slope(u: number): number;
}

function symmetricShape(unit: SymmetricUnit): ShapeModel {
  return {
    kind: unit.kind,
    label: unit.label,
    paramNames: ['position', 'height', 'fwhm'],
    widthParams: [2],
    sizeParam: 1,
    positionParam: 0,
    evaluate(x, p, o, out, jac, col) {
      const c = p[o];
      const h = p[o + 1];
      const w = p[o + 2];
      const n = x.length;
      const k = unit.k / (w * w);
      for (let i = 0; i < n; i++) {
        const d = x[i] - c;
        const u = unit.value(k * d * d);
        out[i] += h * u;
        if (jac) {
          // ∂/∂c = h·(−du/dq)·2kd; ∂/∂w = ∂/∂c · d/w.
          const dc = 2 * k * h * unit.slope(u) * d;
          jac[col * n + i] = dc;
          jac[(col + 1) * n + i] = u;
          jac[(col + 2) * n + i] = (dc * d) / w;
        }
      }
    },
    figures(p, o) {
      return { position: p[o], height: p[o + 1], fwhm: p[o + 2], area: unit.area * p[o + 1] * p[o + 2] };
    },
    figureGradient(p, o) {
      return [[1, 0, 0], [0, 1, 0], [0, 0, 1], [0, unit.area * p[o + 2], unit.area * p[o + 1]]];
    },
    start: (c, h, w) => [c, h, w],
    lower: (b) => [b.from, 0, b.minFwhm],
    upper: (b) => [b.to, Infinity, b.maxFwhm],
  };
}

const gaussian = symmetricShape({ kind: 'gaussian', label: 'Gaussian', k: FOUR_LN2, area: GAUSS_AREA, value: (q) => Math.exp(-q), slope: (u) => u });
const lorentzian = symmetricShape({ kind: 'lorentzian', label: 'Lorentzian', k: 4, area: LORENTZ_AREA, value: (q) => 1 / (1 + q), slope: (u) => u * u });

const pseudoVoigt: ShapeModel = {
  kind: 'pseudo-voigt',
  label: 'pseudo-Voigt',
  paramNames: ['position', 'height', 'fwhm', 'eta'],
  widthParams: [2],
  sizeParam: 1,
  positionParam: 0,
  evaluate(x, p, o, out, jac, col) {
    const c = p[o];
    const h = p[o + 1];
    const w = p[o + 2];
    const eta = p[o + 3];
    const n = x.length;
    const kg = FOUR_LN2 / (w * w);
    const kl = 4 / (w * w);
    for (let i = 0; i < n; i++) {
      const d = x[i] - c;
      const g = Math.exp(-kg * d * d);
      const l = 1 / (1 + kl * d * d);
      out[i] += h * (eta * l + (1 - eta) * g);
      if (jac) {
        // ∂/∂c of each unit shape, then mixed.
        const dg = 2 * kg * g * d;
        const dl = 2 * kl * l * l * d;
        const dc = h * (eta * dl + (1 - eta) * dg);
        jac[col * n + i] = dc;
        jac[(col + 1) * n + i] = eta * l + (1 - eta) * g;
        jac[(col + 2) * n + i] = (dc * d) / w;
        jac[(col + 3) * n + i] = h * (l - g);
      }
    }
  },
  figures(p, o) {
    const a = p[o + 3] * LORENTZ_AREA + (1 - p[o + 3]) * GAUSS_AREA;
    return { position: p[o], height: p[o + 1], fwhm: p[o + 2], area: a * p[o + 1] * p[o + 2] };
  },
  figureGradient(p, o) {
    const h = p[o + 1];
    const w = p[o + 2];
    const a = p[o + 3] * LORENTZ_AREA + (1 - p[o + 3]) * GAUSS_AREA;
    return [[1, 0, 0, 0], [0, 1, 0, 0], [0, 0, 1, 0], [0, a * w, a * h, (LORENTZ_AREA - GAUSS_AREA) * h * w]];
  },
  start: (c, h, w) => [c, h, w, 0.5],
  lower: (b) => [b.from, 0, b.minFwhm, 0],
  upper: (b) => [b.to, Infinity, b.maxFwhm, 1],
};

/**
 * Unit-area EMG density at x (see the file comment for the stable form).
 * Returns 0 where the Gaussian factor (before the peak) or the exponential
 * factor (down the tail) underflows.
 */
export function emgPdf(x: number, mu: number, s: number, t: number): number {
  const u = (x - mu) / s;
  const z = (s / t - u) / SQRT2;
  if (z >= 0) {
    const gauss = Math.exp(-0.5 * u * u);
    return gauss === 0 ? 0 : (gauss * erfcx(z)) / (2 * t);
  }
  const e = (s * s) / (2 * t * t) - (x - mu) / t;
  return e < -746 ? 0 : (Math.exp(e) * erfc(z)) / (2 * t);
}

/**
 * Apex of the unit-area EMG in u = (x − μ)/σ. At the apex the EMG density
 * equals the Gaussian density it was built from, which reduces to
 * erfcx(z*) = K·√(2/π) with K = τ/σ and u* = 1/K − √2·z* (derived here from
 * ∂g/∂μ = g/τ − G/(√(2π)στ); erfcx is strictly decreasing, so z* is unique).
 */
function emgApexU(k: number): number {
  const target = k * Math.sqrt(2 / Math.PI);
  // Bracket: erfcx(−6) ≈ 8.6e15, erfcx(1e8) ≈ 5.6e-9.
  let lo = -6;
  let hi = 1e8;
  let z = target < 1 ? 1 / (target * Math.sqrt(Math.PI)) : 0;
  if (!(z > lo && z < hi)) z = 0;
  for (let it = 0; it < 200; it++) {
    const f = erfcx(z) - target;
    if (f > 0) lo = z;
    else hi = z;
    const fp = 2 * z * erfcx(z) - 2 / Math.sqrt(Math.PI);
    let next = z - f / fp;
    if (!(next > lo && next < hi)) next = 0.5 * (lo + hi);
    if (Math.abs(next - z) <= 1e-15 * Math.max(1, Math.abs(z))) {
      z = next;
      break;
    }
    z = next;
  }
  return 1 / k - SQRT2 * z;
}

/** x where the EMG falls to `level` (0 < level < its height) on one side of the apex. */
function emgCrossing(mu: number, s: number, t: number, apex: number, level: number, side: -1 | 1): number {
  const step = side < 0 ? s : Math.max(s, t);
  let inner = apex;
  let outer = apex + side * step;
  for (let i = 0; i < 200 && emgPdf(outer, mu, s, t) > level; i++) {
    inner = outer;
    outer = apex + side * step * 2 ** (i + 1);
  }
  for (let i = 0; i < 200; i++) {
    const mid = 0.5 * (inner + outer);
    if (mid === inner || mid === outer) break;
    if (emgPdf(mid, mu, s, t) > level) inner = mid;
    else outer = mid;
  }
  return 0.5 * (inner + outer);
}

/** Apex, height, FWHM and area of a·EMG(μ, σ, τ). */
export function emgFigures(mu: number, area: number, sigma: number, tau: number): PeakFigures {
  const apex = mu + sigma * emgApexU(tau / sigma);
  const peak = emgPdf(apex, mu, sigma, tau);
  const left = emgCrossing(mu, sigma, tau, apex, peak / 2, -1);
  const right = emgCrossing(mu, sigma, tau, apex, peak / 2, 1);
  return { position: apex, height: area * peak, fwhm: right - left, area };
}

const emg: ShapeModel = {
  kind: 'emg',
  label: 'exponentially modified Gaussian',
  paramNames: ['mu', 'area', 'sigma', 'tau'],
  widthParams: [2],
  sizeParam: 1,
  positionParam: 0,
  evaluate(x, p, o, out, jac, col) {
    const mu = p[o];
    const a = p[o + 1];
    const s = p[o + 2];
    const t = p[o + 3];
    const n = x.length;
    const gNorm = 1 / (SQRT_2PI * s * t);
    for (let i = 0; i < n; i++) {
      const g = emgPdf(x[i], mu, s, t);
      out[i] += a * g;
      if (jac) {
        const d = x[i] - mu;
        const gg = Math.exp((-0.5 * d * d) / (s * s)) * gNorm; // G / (√(2π) σ τ)
        jac[col * n + i] = a * (g / t - gg);
        jac[(col + 1) * n + i] = g;
        jac[(col + 2) * n + i] = a * ((g * s) / (t * t) - gg * (s / t + d / s));
        jac[(col + 3) * n + i] = a * (g * (-1 / t - (s * s) / (t * t * t) + d / (t * t)) + (gg * s * s) / (t * t));
      }
    }
  },
  figures(p, o) {
    return emgFigures(p[o], p[o + 1], p[o + 2], p[o + 3]);
  },
  figureGradient(p, o) {
    // Central differences on the derived figures (apex and half-height crossings are solved to
    // ~1e-15, so a relative step of 1e-6 leaves ~1e-9 relative error in each derivative).
    const rows = [[0, 0, 0, 0], [0, 0, 0, 0], [0, 0, 0, 0], [0, 0, 0, 0]];
    const q = [p[o], p[o + 1], p[o + 2], p[o + 3]];
    const scale = [p[o + 2], Math.abs(p[o + 1]), p[o + 2], p[o + 3]];
    for (let j = 0; j < 4; j++) {
      const h = 1e-6 * scale[j];
      const up = q.slice();
      const dn = q.slice();
      up[j] += h;
      dn[j] -= h;
      const fu = emgFigures(up[0], up[1], up[2], up[3]);
      const fd = emgFigures(dn[0], dn[1], dn[2], dn[3]);
      FIGURE_NAMES.forEach((name, r) => {
        rows[r][j] = (fu[name] - fd[name]) / (2 * h);
      });
    }
    return rows;
  },
  start(c, h, w) {
    // A mildly tailing start (τ = σ/2): apex ≈ μ + 0.43σ (the apex of SciPy's stats.exponnorm, K = 0.5), height ≈ h.
    const s = w / FWHM_PER_SIGMA;
    const t = 0.5 * s;
    const mu = c - 0.428 * s;
    const peak = emgPdf(c, mu, s, t);
    return [mu, h / peak, s, t];
  },
  lower: (b) => [b.from - b.maxFwhm, 0, b.minFwhm / FWHM_PER_SIGMA, 1e-3 * b.minFwhm / FWHM_PER_SIGMA],
  upper: (b) => [b.to, Infinity, b.maxFwhm / FWHM_PER_SIGMA, b.maxFwhm],
};

export const SHAPES: Record<ShapeKind, ShapeModel> = {
  gaussian,
  lorentzian,
  'pseudo-voigt': pseudoVoigt,
  emg,
};

export { EIGHT_LN2, FWHM_PER_SIGMA, GAUSS_AREA, LORENTZ_AREA };
