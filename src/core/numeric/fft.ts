/**
 * Discrete Fourier transforms of any length, built on the radix-4
 * power-of-two FFT of the `fft.js` package. Lengths that are not a power of
 * two go through Bluestein's chirp-z algorithm (Bluestein 1970, IEEE Trans.
 * Audio Electroacoust. 18:451), which gives the exact length-n DFT rather
 * than the DFT of a zero-padded signal, so the frequency grid is k/(n·Δx).
 */
import FFT from 'fft.js';

/** Smallest power of two ≥ n (n ≥ 1); at least 2, the smallest size fft.js accepts. */
export function nextPowerOfTwo(n: number): number {
  let p = 2;
  while (p < n) p *= 2;
  return p;
}

const plans = new Map<number, FFT>();
let lastBig: FFT | null = null;
/**
 * fft.js plan for a power-of-two size. Small plans are kept; of the big ones
 * (their tables take megabytes) only the latest, since a forward and an
 * inverse transform of one size usually follow each other, and only until
 * {@link releaseBigPlan} (the worker lets it go after each job: at 2²¹
 * points, the size a 10⁶-point frequency filter needs, it holds 42 MB).
 */
function plan(size: number): FFT {
  if (size <= 1 << 16) {
    let f = plans.get(size);
    if (!f) {
      f = new FFT(size);
      plans.set(size, f);
    }
    return f;
  }
  if (!lastBig || lastBig.size !== size) lastBig = typedPlan(size);
  return lastBig;
}

/** Let the big plan go (it is made again when next needed: 120–250 ms at 2²¹ points on this machine under load). */
export function releaseBigPlan(): void {
  lastBig = null;
}

/** The fields of an fft.js plan (lib/fft.js 4.0.4); the transforms read nothing else. */
interface PlanFields {
  size: number;
  _csize: number;
  table: Float64Array;
  _width: number;
  _bitrev: Int32Array;
  _out: null;
  _data: null;
  _inv: number;
}

/**
 * An fft.js plan whose tables are typed arrays, made directly with fft.js's
 * own expressions (so the same numbers, bit for bit): its constructor builds
 * them as plain arrays of boxed numbers, which for 2²¹ points held about
 * 60 MB of the worker's heap against 42 MB as Float64Array and Int32Array,
 * and with the copy took 218–275 ms against 118–247 ms made directly
 * (5 alternated pairs, load 2.8; issue 16). It only reads them by index.
 */
function typedPlan(size: number): FFT {
  const f = Object.create(FFT.prototype) as PlanFields;
  f.size = size | 0;
  f._csize = size << 1;
  const table = new Float64Array(f.size * 2);
  for (let i = 0; i < table.length; i += 2) {
    const angle = Math.PI * i / f.size;
    table[i] = Math.cos(angle);
    table[i + 1] = -Math.sin(angle);
  }
  f.table = table;
  let power = 0;
  for (let t = 1; f.size > t; t <<= 1) power++;
  f._width = power % 2 === 0 ? power - 1 : power;
  const bitrev = new Int32Array(1 << f._width);
  for (let j = 0; j < bitrev.length; j++) {
    let r = 0;
    for (let shift = 0; shift < f._width; shift += 2) {
      const revShift = f._width - shift - 2;
      r |= ((j >>> shift) & 3) << revShift;
    }
    bitrev[j] = r;
  }
  f._bitrev = bitrev;
  f._out = null;
  f._data = null;
  f._inv = 0;
  return f as unknown as FFT;
}

/** Power-of-two transform of interleaved complex data into a new array. */
function fftPow2(data: Float64Array, inverse: boolean): Float64Array {
  const size = data.length / 2;
  const f = plan(size);
  const out = new Float64Array(2 * size);
  if (inverse) f.inverseTransform(out, data);
  else f.transform(out, data);
  return out;
}

/** Forward power-of-two transform of real data (fft.js realTransform, about 40 % faster), full spectrum. */
function fftPow2Real(re: Float64Array): Float64Array {
  const f = plan(re.length);
  const out = new Float64Array(2 * re.length);
  f.realTransform(out, re);
  f.completeSpectrum(out);
  return out;
}

/**
 * Discrete Fourier transform X[k] = Σⱼ x[j]·exp(∓2πi·jk/n) of complex data of
 * any length n ≥ 1. The inverse includes the 1/n factor. Powers of two use
 * fft.js directly; other lengths use Bluestein's algorithm, O(n log n).
 * @param re real parts (not changed).
 * @param im imaginary parts, same length (not changed).
 * @param inverse false (default) for the forward transform.
 * @returns new arrays { re, im }.
 * @throws RangeError when the lengths differ or are 0.
 */
export function dft(re: Float64Array, im: Float64Array, inverse = false): { re: Float64Array; im: Float64Array } {
  const n = re.length;
  if (n === 0 || im.length !== n) throw new RangeError('The transform needs equal, non-empty real and imaginary parts.');
  if (n === 1) return { re: Float64Array.from(re), im: Float64Array.from(im) };
  if ((n & (n - 1)) === 0) {
    let out: Float64Array;
    if (!inverse && im.every((v) => v === 0)) out = fftPow2Real(re);
    else {
      const data = new Float64Array(2 * n);
      for (let j = 0; j < n; j++) {
        data[2 * j] = re[j];
        data[2 * j + 1] = im[j];
      }
      out = fftPow2(data, inverse);
    }
    const r = new Float64Array(n);
    const i = new Float64Array(n);
    for (let k = 0; k < n; k++) {
      r[k] = out[2 * k];
      i[k] = out[2 * k + 1];
    }
    return { re: r, im: i };
  }
  return bluestein(re, im, inverse);
}

function bluestein(re: Float64Array, im: Float64Array, inverse: boolean): { re: Float64Array; im: Float64Array } {
  const n = re.length;
  const m = nextPowerOfTwo(2 * n - 1);
  const sgn = inverse ? 1 : -1;
  // Chirp w[j] = exp(sgn·iπ j²/n); j² is reduced mod 2n first so large j keeps full precision.
  const wr = new Float64Array(n);
  const wi = new Float64Array(n);
  for (let j = 0; j < n; j++) {
    const jj = (j * j) % (2 * n);
    const a = (Math.PI * jj) / n;
    wr[j] = Math.cos(a);
    wi[j] = sgn * Math.sin(a);
  }
  const a = new Float64Array(2 * m);
  for (let j = 0; j < n; j++) {
    a[2 * j] = re[j] * wr[j] - im[j] * wi[j];
    a[2 * j + 1] = re[j] * wi[j] + im[j] * wr[j];
  }
  const b = new Float64Array(2 * m);
  b[0] = wr[0];
  b[1] = -wi[0];
  for (let j = 1; j < n; j++) {
    b[2 * j] = b[2 * (m - j)] = wr[j];
    b[2 * j + 1] = b[2 * (m - j) + 1] = -wi[j];
  }
  const fa = fftPow2(a, false);
  const fb = fftPow2(b, false);
  for (let k = 0; k < m; k++) {
    const xr = fa[2 * k], xi = fa[2 * k + 1];
    const yr = fb[2 * k], yi = fb[2 * k + 1];
    fa[2 * k] = xr * yr - xi * yi;
    fa[2 * k + 1] = xr * yi + xi * yr;
  }
  const conv = fftPow2(fa, true);
  const outR = new Float64Array(n);
  const outI = new Float64Array(n);
  const scale = inverse ? 1 / n : 1;
  for (let k = 0; k < n; k++) {
    const cr = conv[2 * k], ci = conv[2 * k + 1];
    outR[k] = (cr * wr[k] - ci * wi[k]) * scale;
    outI[k] = (cr * wi[k] + ci * wr[k]) * scale;
  }
  return { re: outR, im: outI };
}

/**
 * One-sided power spectrum of evenly spaced samples: the exact length-n DFT
 * (no padding, no window, mean kept), scaled so that each bin holds mean
 * square: a sine of amplitude A on bin k (0 < k < n/2) gives power A²/2 and
 * the powers sum to the mean of y² (Parseval).
 * @param y samples (not changed), n ≥ 1.
 * @param dx sample spacing in x-units (> 0).
 * @returns freq in cycles per x-unit, k/(n·dx) for k = 0…floor(n/2), and power in y-units².
 * @throws RangeError for empty y or a spacing that is not positive.
 */
export function powerSpectrum(y: Float64Array, dx: number): { freq: Float64Array; power: Float64Array } {
  const n = y.length;
  if (n === 0) throw new RangeError('There are no samples to transform.');
  if (!(Number.isFinite(dx) && dx > 0)) throw new RangeError(`The sample spacing must be a positive number (got ${dx}).`);
  const { re, im } = dft(y, new Float64Array(n));
  const half = Math.floor(n / 2);
  const freq = new Float64Array(half + 1);
  const power = new Float64Array(half + 1);
  for (let k = 0; k <= half; k++) {
    freq[k] = k / (n * dx);
    const p = (re[k] * re[k] + im[k] * im[k]) / (n * n);
    // Bins other than 0 and n/2 stand for a positive and a negative frequency.
    power[k] = k === 0 || 2 * k === n ? p : 2 * p;
  }
  return { freq, power };
}
