/**
 * Exponentially modified Gaussian density for test traces (Grushka 1972,
 * Anal. Chem. 44:1733; the same as SciPy's stats.exponnorm with K = τ/σ,
 * loc μ, scale σ — checked against SciPy in peak-areas.test.ts). erfc from
 * Numerical Recipes' erfcc (relative error < 1.2e-7), taken in log form so
 * the far left tail does not overflow.
 */
function logErfc(z: number): number {
  const t = 1 / (1 + 0.5 * z);
  return Math.log(t) + (-z * z - 1.26551223 + t * (1.00002368 + t * (0.37409196 + t * (0.09678418 +
    t * (-0.18628806 + t * (0.27886807 + t * (-1.13520398 + t * (1.48851587 +
    t * (-0.82215223 + t * 0.17087277)))))))));
}

/** EMG density at t: area 1, Gaussian σ, exponential time constant τ (τ = 0: the Gaussian). */
export function emgPdf(t: number, mu: number, sigma: number, tau: number): number {
  if (tau <= 0) return Math.exp(-0.5 * ((t - mu) / sigma) ** 2) / (sigma * Math.sqrt(2 * Math.PI));
  const z = (sigma / tau - (t - mu) / sigma) / Math.SQRT2;
  const e = (sigma * sigma) / (2 * tau * tau) - (t - mu) / tau;
  if (z >= 0) return Math.exp(e + logErfc(z)) / (2 * tau);
  return (Math.exp(e) * (2 - Math.exp(logErfc(-z)))) / (2 * tau);
}
