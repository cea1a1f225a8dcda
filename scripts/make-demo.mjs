#!/usr/bin/env node
/**
 * Writes the invented demo data to public/demo/ (or to the folder given as
 * the first argument): a made-up teaching-lab separation of the food-dye
 * mixture "Orchard Red / Lagoon Blue" on a small student rig, read as
 * absorbance at 520 nm (mAU) against time (min).
 *
 * Every number comes from this script and its seed: six Gaussian peaks
 * (one a small shoulder on a larger peak, one near S/N 10, one far above
 * S/N 100), a slow quadratic baseline drift, white Gaussian noise of known
 * standard deviation, and one single-point spike in the sample run only.
 * Files:
 *   demo-sample.csv        the run to clean and measure (with the spike)
 *   demo-blank.csv         same drift, independent noise, no peaks, no spike
 *   demo-scan-1..8.csv     the same run repeated: same peaks and drift, independent noise, no spike
 *   demo-truth.json        everything above, for tests
 * and, for calibration (drawn afterwards from a separate seed, so the files
 * above stay byte for byte what they were):
 *   demo-standard-L{1,2,3}-{a,b}.csv  standards of three invented dyes at three levels, in duplicate:
 *                          the same drift, noise SD and peak shapes as the sample, no other peaks
 *   demo-named-peaks.csv   the dyes' expected positions and windows (name, position, window)
 *   demo-standards.csv     the known amounts in each standard (standard, one column per dye)
 *   demo-standards-truth.json  the dyes' response factors, the standards' amounts and the
 *                          true amounts in demo-sample.csv
 *
 * Plain Node, no dependencies, so `npm run demo` works before a build.
 * Random numbers: mulberry32 (Tommy Ettinger, public domain) for uniforms
 * and the Box–Muller transform (Box & Muller 1958, Ann. Math. Statist. 29,
 * 610–611) for normals. The same seed always writes the same bytes.
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';

const SEED = 20260314;
const here = dirname(fileURLToPath(import.meta.url));

/** mulberry32: 32-bit state, uniform on [0, 1). */
function mulberry32(seed) {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Standard normal numbers by Box–Muller, keeping the second of each pair. */
function normalSource(uniform) {
  let spare = null;
  return () => {
    if (spare !== null) {
      const s = spare;
      spare = null;
      return s;
    }
    let u1 = uniform();
    while (u1 <= 0) u1 = uniform(); // log(0) would be -Infinity
    const u2 = uniform();
    const r = Math.sqrt(-2 * Math.log(u1));
    spare = r * Math.sin(2 * Math.PI * u2);
    return r * Math.cos(2 * Math.PI * u2);
  };
}

// Sampling grid: 0 to 12 min, one point per 0.01 min.
const X_START = 0;
const X_STEP = 0.01;
const POINTS = 1201;

const NOISE_SD = 0.05; // mAU, white Gaussian, the same in every file

// Baseline drift b(t) = c0 + c1·t + c2·t² (mAU, t in min): a lamp slowly warming.
const DRIFT = { c0: 0.4, c1: 0.1, c2: 0.005 };

const FWHM_PER_SIGMA = 2 * Math.sqrt(2 * Math.LN2);
const AREA_PER_HEIGHT_SIGMA = Math.sqrt(2 * Math.PI);

// Heights in mAU above the baseline; centres and sigmas in min.
const PEAK_LIST = [
  { label: 'sharp early peak', centre: 1.2, height: 1.5, sigma: 0.02 },
  { label: 'near quantitation limit', centre: 2.6, height: 0.5, sigma: 0.05 },
  { label: 'large isolated peak', centre: 4.3, height: 8.0, sigma: 0.08 },
  { label: 'main peak carrying the shoulder', centre: 6.0, height: 3.0, sigma: 0.1 },
  // 3.5 main-peak σ out, on the main peak's tail: shallow enough there that the shoulder keeps a top of its own.
  { label: 'shoulder', centre: 6.35, height: 0.22, sigma: 0.05 },
  { label: 'broad late peak', centre: 8.5, height: 1.2, sigma: 0.15 },
];

// One point of the sample run, far from every peak (8.5 min peak: 10 sigma away).
const SPIKE_INDEX = 1000;
const SPIKE_SIZE_IN_NOISE_SD = 40;

const round = (v, digits) => Number(v.toFixed(digits));

/**
 * The demo for a seed: the x grid, every file's y (sample first, then the
 * blank, then the scans) and the ground truth. The default seed gives the
 * committed files; other seeds give the same run with other noise (tests
 * use them to average over realisations).
 */
export function makeDemo(seed = SEED) {
  const x = Array.from({ length: POINTS }, (_, i) => round(X_START + i * X_STEP, 2));
  const drift = x.map((t) => DRIFT.c0 + DRIFT.c1 * t + DRIFT.c2 * t * t);
  const peaksOnly = x.map((t) => PEAK_LIST.reduce((s, p) => s + p.height * Math.exp(-0.5 * ((t - p.centre) / p.sigma) ** 2), 0));

  const normal = normalSource(mulberry32(seed));
  const noisy = (base) => base.map((v) => v + NOISE_SD * normal());

  // Noise is drawn in this order, one file after the other, so each file's noise is independent of the others.
  const signal = x.map((_, i) => drift[i] + peaksOnly[i]);
  const files = [];
  const sample = noisy(signal);
  const spikeSize = SPIKE_SIZE_IN_NOISE_SD * NOISE_SD;
  sample[SPIKE_INDEX] += spikeSize;
  files.push({ file: 'demo-sample.csv', role: 'sample', run: 'run 3', y: sample, peaks: true, spike: true });
  files.push({ file: 'demo-blank.csv', role: 'blank', run: 'blank (solvent only)', y: noisy(drift), peaks: false, spike: false });
  for (let k = 1; k <= 8; k++) {
    files.push({ file: `demo-scan-${k}.csv`, role: 'scan', run: `repeat scan ${k} of 8`, y: noisy(signal), peaks: true, spike: false });
  }

  const truth = {
    description:
      'Invented demo data: a made-up teaching-lab separation of the food-dye mixture "Orchard Red / Lagoon Blue", ' +
      'absorbance at 520 nm against time. Written by scripts/make-demo.mjs; every number below is what the script used.',
    generator: 'mulberry32 uniforms, Box-Muller normals; noise drawn file after file in the order of "files"',
    seed,
    x: { name: 'Time', unit: 'min', start: X_START, step: X_STEP, points: POINTS },
    y: { name: 'Absorbance 520 nm', unit: 'mAU', decimals: 4 },
    noiseSd: NOISE_SD,
    drift: { formula: 'c0 + c1*t + c2*t^2 (mAU, t in min)', ...DRIFT },
    peaks: PEAK_LIST.map((p) => ({
      label: p.label,
      centre: p.centre,
      height: p.height,
      sigma: p.sigma,
      fwhm: round(FWHM_PER_SIGMA * p.sigma, 6),
      area: round(AREA_PER_HEIGHT_SIGMA * p.height * p.sigma, 6),
      trueSn: round(p.height / NOISE_SD, 6),
    })),
    snDefinition: 'trueSn = peak height above the drift / noise standard deviation',
    spike: {
      file: 'demo-sample.csv',
      index: SPIKE_INDEX,
      x: x[SPIKE_INDEX],
      size: spikeSize,
      sizeInNoiseSd: SPIKE_SIZE_IN_NOISE_SD,
    },
    files: files.map((f) => ({ file: f.file, role: f.role, peaks: f.peaks, spike: f.spike })),
  };
  return { x, files, truth };
}

const header = (run, seed) => [
  `Run: Orchard Red / Lagoon Blue practice separation, ${run}`,
  'Date: 2026-03-14',
  'Rig: student bench rig B (made up)',
  'Detector: absorbance at 520 nm',
  `Note: synthetic demo data made by scripts/make-demo.mjs seed ${seed}`,
  'Time (min),Absorbance 520 nm (mAU)',
];

/** The CSV text of one file, y rounded to the 4 decimals the files carry; `seed` is the one named in its note line. */
export function demoCsv(x, run, y, seed = SEED) {
  const lines = header(run, seed);
  for (let i = 0; i < POINTS; i++) lines.push(`${x[i].toFixed(2)},${y[i].toFixed(4)}`);
  return `${lines.join('\n')}\n`;
}

// ---------------------------------------------------------------------------
// Calibration standards. Three of the sample's peaks are given the names of
// invented dyes; each dye's peak area is proportional to its amount (mg/L)
// with a made-up response factor, so the sample's true amounts are its peak
// areas divided by those factors. Standards hold only the three dyes, at three
// levels each, each level made twice (two injections, independent noise).
// Noise comes from its own seed, drawn after everything above.
const STANDARDS_SEED = 20260315;
const AMOUNT_UNIT = 'mg/L';
const DYES = [
  // responsePerAmount: peak area (mAU·min) per mg/L; levels: mg/L; window: ± min for the named-peak table.
  { name: 'Orchard Red', peak: 'large isolated peak', responsePerAmount: 0.4, levels: [2, 5, 8], window: 0.15 },
  { name: 'Meadow Gold', peak: 'near quantitation limit', responsePerAmount: 0.05, levels: [1, 3, 6], window: 0.1 },
  { name: 'Lagoon Blue', peak: 'broad late peak', responsePerAmount: 0.15, levels: [1.5, 3.5, 6], window: 0.3 },
].map((d) => {
  const p = PEAK_LIST.find((q) => q.label === d.peak);
  return { ...d, centre: p.centre, sigma: p.sigma, sampleArea: AREA_PER_HEIGHT_SIGMA * p.height * p.sigma };
});
const LEVELS = 3;
const INJECTIONS = ['a', 'b'];

/** The calibration standards (own seed), the named-peak table and the amounts table, with their ground truth. */
export function makeStandards() {
  const x = Array.from({ length: POINTS }, (_, i) => round(X_START + i * X_STEP, 2));
  const drift = x.map((t) => DRIFT.c0 + DRIFT.c1 * t + DRIFT.c2 * t * t);
  const stdNormal = normalSource(mulberry32(STANDARDS_SEED));
  const standardFiles = [];
  for (let level = 1; level <= LEVELS; level++) {
    for (const inj of INJECTIONS) {
      const amounts = DYES.map((d) => d.levels[level - 1]);
      const y = x.map((t, i) => {
        let v = drift[i];
        DYES.forEach((d, k) => {
          const height = (amounts[k] * d.responsePerAmount) / (AREA_PER_HEIGHT_SIGMA * d.sigma);
          v += height * Math.exp(-0.5 * ((t - d.centre) / d.sigma) ** 2);
        });
        return v + NOISE_SD * stdNormal();
      });
      standardFiles.push({ file: `demo-standard-L${level}-${inj}.csv`, run: `calibration standard, level ${level} of ${LEVELS}, injection ${inj}`, level, injection: inj, amounts, y });
    }
  }

  const namedPeaksCsv = ['name,position (min),window (min)', ...DYES.map((d) => `${d.name},${d.centre},${d.window}`)];
  const standardsCsv = [
    `standard,${DYES.map((d) => `${d.name} (${AMOUNT_UNIT})`).join(',')}`,
    ...standardFiles.map((f) => `${f.file},${f.amounts.join(',')}`),
  ];

  const standardsTruth = {
    description:
      'Invented calibration standards for the demo: three peaks of demo-sample.csv named as made-up dyes, whose peak area is ' +
      'proportional to amount with the response factors below. Written by scripts/make-demo.mjs; every number below is what the script used.',
    generator: 'mulberry32 uniforms, Box-Muller normals, own seed; noise drawn file after file in the order of "files"',
    seed: STANDARDS_SEED,
    amountUnit: AMOUNT_UNIT,
    responseDefinition: 'peak area above the drift (mAU*min) = responsePerAmount * amount; Gaussian peaks of the sample\'s centre and sigma',
    noiseSd: NOISE_SD,
    drift: { formula: 'c0 + c1*t + c2*t^2 (mAU, t in min)', ...DRIFT },
    dyes: DYES.map((d) => ({
      name: d.name,
      samplePeakLabel: d.peak,
      centre: d.centre,
      sigma: d.sigma,
      window: d.window,
      responsePerAmount: d.responsePerAmount,
      levels: d.levels,
      sampleAmount: round(d.sampleArea / d.responsePerAmount, 9),
    })),
    namedPeaksFile: 'demo-named-peaks.csv',
    amountsFile: 'demo-standards.csv',
    sampleFile: 'demo-sample.csv',
    files: standardFiles.map((f) => ({ file: f.file, role: 'standard', level: f.level, injection: f.injection, amounts: f.amounts })),
  };
  return { x, standardFiles, namedPeaksCsv, standardsCsv, standardsTruth };
}

// Written only when run as a script (tests import makeDemo).
if (process.argv[1] && resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  const outDir = resolve(process.argv[2] ?? join(here, '..', 'public', 'demo'));
  const { x, files, truth } = makeDemo();
  mkdirSync(outDir, { recursive: true });
  for (const f of files) writeFileSync(join(outDir, f.file), demoCsv(x, f.run, f.y));
  writeFileSync(join(outDir, 'demo-truth.json'), `${JSON.stringify(truth, null, 2)}\n`);
  console.log(`Wrote ${files.length} traces and demo-truth.json to ${outDir}`);
  const std = makeStandards();
  for (const f of std.standardFiles) writeFileSync(join(outDir, f.file), demoCsv(std.x, f.run, f.y, STANDARDS_SEED));
  writeFileSync(join(outDir, 'demo-named-peaks.csv'), `${std.namedPeaksCsv.join('\n')}\n`);
  writeFileSync(join(outDir, 'demo-standards.csv'), `${std.standardsCsv.join('\n')}\n`);
  writeFileSync(join(outDir, 'demo-standards-truth.json'), `${JSON.stringify(std.standardsTruth, null, 2)}\n`);
  console.log(`Wrote ${std.standardFiles.length} standards, demo-named-peaks.csv, demo-standards.csv and demo-standards-truth.json to ${outDir}`);
}
