/**
 * The exact arrays of a series that may have stayed in the worker
 * (worker/series.ts), for a panel that computes on them: null while they are
 * on their way, the series itself when it crossed whole.
 */
import { useEffect, useState } from 'react';
import type { Signal } from '../core/steps/types.ts';
import { exactSignal, farOf } from '../worker/bridge.ts';
import { getBackend } from '../state/service.ts';

export function useExactSignal(s: Signal | null, wanted = true): Signal | null {
  const [got, setGot] = useState<{ of: Signal; exact: Signal } | null>(null);
  const far = !!s && farOf(s) !== undefined;
  useEffect(() => {
    if (!s || !far || !wanted) return;
    let stale = false;
    exactSignal(getBackend(), s).then((exact) => { if (!stale) setGot({ of: s, exact }); }, () => undefined /* let go meanwhile: the newer result asks again */);
    return () => { stale = true; };
  }, [s, far, wanted]);
  if (!s) return null;
  if (!far) return s;
  return got?.of === s ? got.exact : null;
}
