/**
 * The peak table is unchanged, byte for byte, on a fixed list of cases
 * (peak-table-digests.ts): the SHA-256 of each table's full JSON equals the
 * one in test/reference/peak-table-digests.json.
 *
 * Those digests were made at commit 4591a42, before the issue-16 kernel
 * round 2 (cheaper local measures, the same rules): that round promised
 * identical tables, and this test holds every later speed change to it.
 * Regenerate them ONLY when a measuring rule changes on purpose (say so in
 * the commit):
 *
 *   PEAK_DIGESTS_WRITE=1 npx vitest run test/core/measure/peak-table-digests.test.ts
 *
 * With that variable set the test writes the file instead of comparing.
 */
import { readFileSync, writeFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { digestCases, digestOf, type Digest } from './peak-table-digests.ts';

const FILE = new URL('../../reference/peak-table-digests.json', import.meta.url);
const WRITE = process.env.PEAK_DIGESTS_WRITE === '1';

describe('peak table digests: the same table byte for byte as at 4591a42', () => {
  it('every case (bench trace 10⁶, demo seeds 1–100 and variants, MALDI, long traces at 10⁵)', () => {
    const got: Record<string, Digest> = {};
    for (const c of digestCases()) got[c.name] = digestOf(c);
    if (WRITE) {
      writeFileSync(FILE, `${JSON.stringify({ madeAt: process.env.PEAK_DIGESTS_COMMIT ?? 'unknown', cases: got }, null, 1)}\n`);
      return;
    }
    const want = JSON.parse(readFileSync(FILE, 'utf8')) as { madeAt: string; cases: Record<string, Digest> };
    expect(want.madeAt).toBe('4591a42');
    expect(Object.keys(got)).toEqual(Object.keys(want.cases));
    // The bench trace and the long traces find thousands of rows: the digests are of real tables.
    expect(want.cases['bench trace 1e6'].rows).toBeGreaterThan(1000);
    for (const name of Object.keys(want.cases)) expect(got[name], name).toEqual(want.cases[name]);
  }, 180_000);
});
