/**
 * One way to put x in order for every loader (delimited text, JCAMP-DX,
 * netCDF with its own time array): sort the points by x, keeping the order
 * read among equal x, then average y over each set of equal x, since a
 * trace needs x strictly rising. Each thing done is said in one sentence
 * that names points by their x and by their place in the order read (the
 * n-th point read), never by a format's own lines, so the same data give
 * the same sentences whatever the file format.
 */

export interface OrderedByX {
  /** Strictly ascending x (the input when nothing needed doing). */
  x: Float64Array;
  /** Each y, reordered and averaged the same way as x. */
  ys: Float64Array[];
  /** Sentences for the load report; empty when x was already strictly ascending. */
  notices: string[];
}

const plural = (n: number, one: string, many: string) => (n === 1 ? one : many);

/**
 * Sort by x (stable) and average y over repeated x. NaN in a y (a cell that
 * was not a number) takes no part in its set's average; a set with no number
 * gives NaN. x must be finite (the loaders check it first).
 *
 * @param x x as read, any order; not changed (a Float64Array already in
 *   strictly ascending order comes back as it is, not copied)
 * @param ys the y columns as read, each as long as x; not changed
 * @param subject what the sentences are about when a file holds several
 *   traces with their own x (a JCAMP-DX block); '' for none
 * @returns strictly ascending x, the matching y, and the notices
 */
export function orderByX(x: ArrayLike<number>, ys: readonly ArrayLike<number>[], subject = ''): OrderedByX {
  const n = x.length;
  const notices: string[] = [];
  const lead = subject === '' ? '' : `${subject}: `;
  const f64 = (a: ArrayLike<number>) => (a instanceof Float64Array ? a : Float64Array.from(a));
  let sx = f64(x);
  let sys = ys.map(f64);
  let read: Uint32Array | null = null; // place in the order read, once sorted

  let drop = -1;
  let descending = n > 1;
  for (let i = 1; i < n; i++) {
    if (drop < 0 && sx[i] < sx[i - 1]) drop = i;
    if (!(sx[i] < sx[i - 1])) descending = false;
  }
  if (drop >= 0) {
    const order = new Uint32Array(n);
    for (let i = 0; i < n; i++) order[i] = i;
    const xv = sx;
    order.sort((a, b) => xv[a] - xv[b] || a - b);
    notices.push(
      descending
        ? `${lead}x was not in ascending order (it was written in descending order, ${xv[0]} to ${xv[n - 1]}), so the points were put in ascending order.`
        : `${lead}x was not in ascending order (at point ${drop + 1} as read it falls from ${xv[drop - 1]} to ${xv[drop]}), so the points were sorted by x; points with equal x keep the order read.`,
    );
    sx = Float64Array.from(order, (i) => xv[i]);
    sys = sys.map((y) => Float64Array.from(order, (i) => y[i]));
    read = order;
  }
  const placeRead = (i: number) => (read === null ? i : read[i]) + 1;

  let repeats = 0, sets = 0, firstRepeat = -1;
  for (let i = 1; i < n; i++) {
    if (sx[i] === sx[i - 1]) {
      repeats++;
      if (i === 1 || sx[i - 1] !== sx[i - 2]) sets++;
      if (firstRepeat < 0) firstRepeat = i;
    }
  }
  if (repeats === 0) return { x: sx, ys: sys, notices };

  const m = n - repeats;
  const outX = new Float64Array(m);
  const outY = sys.map(() => new Float64Array(m));
  let o = 0;
  for (let i = 0; i < n;) {
    let j = i + 1;
    while (j < n && sx[j] === sx[i]) j++;
    outX[o] = sx[i];
    for (let k = 0; k < sys.length; k++) {
      let sum = 0, count = 0;
      for (let r = i; r < j; r++) { const v = sys[k][r]; if (!Number.isNaN(v)) { sum += v; count++; } }
      outY[k][o] = count ? sum / count : NaN;
    }
    o++;
    i = j;
  }
  notices.push(
    `${lead}${repeats} ${plural(repeats, 'point repeats', 'points repeat')} an x value already present, in ${sets} ${plural(sets, 'set', 'sets')} ` +
      `(first: x = ${sx[firstRepeat]} at points ${placeRead(firstRepeat - 1)} and ${placeRead(firstRepeat)} as read); ` +
      'y was averaged over each set of equal x, since a trace needs x strictly rising.',
  );
  return { x: outX, ys: outY, notices };
}
