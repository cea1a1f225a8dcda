/**
 * Load one of the real traces in test/fixtures/real (see the README there for
 * source, licence and citation) through the page's own loader.
 */
import { readFileSync } from 'node:fs';
import { loadFile } from '../../src/core/io/load.ts';

const DIR = new URL('../fixtures/real/', import.meta.url);

/** The loader's result for `name` (e.g. "maldi-fiedler2009-01.csv"); throws if it does not load. */
export function loadReal(name: string) {
  const r = loadFile(new Uint8Array(readFileSync(new URL(name, DIR))), name);
  if (!r.ok) throw new Error(`${name}: ${r.error.problem}`);
  return r;
}

/** The MALDI-TOF spectra exported (MALDIquant fiedler2009subset items 1, 2 and 9). */
export const MALDI_FILES = ['maldi-fiedler2009-01.csv', 'maldi-fiedler2009-02.csv', 'maldi-fiedler2009-09.csv'] as const;
