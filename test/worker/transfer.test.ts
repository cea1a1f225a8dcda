/**
 * Results cross to the page with their arrays transferred; the copies made
 * first must cover every typed array, or the worker's cached noise profiles
 * (Int32Array run starts) would be detached and the next result could not
 * be posted (found on the page: undo after a window change showed a stale result).
 */
import { describe, expect, it } from 'vitest';
import { cloneResultForTransfer, transferablesOf } from '../../src/worker/transfer.ts';

describe('result copies for transfer', () => {
  it('copy every typed array, so transferring the copies leaves the originals intact', () => {
    const kept = { profile: { starts: Int32Array.of(0, 5), sigma: Float64Array.of(1, 2) }, mask: Uint8Array.of(1, 0) };
    const copy = cloneResultForTransfer(kept);
    const buffers = transferablesOf(copy);
    for (const b of [kept.profile.starts.buffer, kept.profile.sigma.buffer, kept.mask.buffer]) expect(buffers).not.toContain(b);
    structuredClone(copy, { transfer: buffers });
    expect(Array.from(kept.profile.starts)).toEqual([0, 5]);
    expect(Array.from(kept.profile.sigma)).toEqual([1, 2]);
  });
});
