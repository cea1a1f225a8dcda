/**
 * Seeded random numbers for tests, benchmarks and invented demo data.
 * Never used for anything that needs unpredictability.
 */

/** A seeded source of uniform and standard normal numbers. */
export interface Rng {
  /** Uniform on [0, 1), 32-bit resolution. */
  uniform(): number;
  /** Standard normal (mean 0, standard deviation 1). */
  normal(): number;
}

/**
 * Make a seeded generator: mulberry32 for uniforms (Tommy Ettinger's public
 * domain 32-bit generator; period 2^32) and the Box–Muller transform for
 * normals (Box & Muller 1958, Ann. Math. Statist. 29, 610–611). The second
 * normal of each Box–Muller pair is kept and returned on the next call.
 * The same seed always gives the same sequence, on every platform.
 * @param seed any finite number; it is reduced to an unsigned 32-bit integer.
 * @throws RangeError when seed is not a finite number.
 */
export function makeRng(seed: number): Rng {
  if (!Number.isFinite(seed)) throw new RangeError(`The random seed must be a finite number, not ${seed}.`);
  let state = Math.trunc(seed) >>> 0;
  let spare: number | null = null;

  const uniform = (): number => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };

  const normal = (): number => {
    if (spare !== null) {
      const s = spare;
      spare = null;
      return s;
    }
    // 1 - u lies in (0, 1], so the logarithm is finite.
    const u1 = 1 - uniform();
    const u2 = uniform();
    const r = Math.sqrt(-2 * Math.log(u1));
    const a = 2 * Math.PI * u2;
    spare = r * Math.sin(a);
    return r * Math.cos(a);
  };

  return { uniform, normal };
}

/** n seeded standard-normal values (a fresh {@link makeRng} on `seed`). */
export function normalArray(seed: number, n: number): Float64Array {
  const rng = makeRng(seed);
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) out[i] = rng.normal();
  return out;
}
