// One rule for x order in every loader (issue 19): sorted, y averaged over
// repeated x, each said in one sentence that names points, not a format's
// lines. The expected values are written out from the data (arithmetic means
// of the y at each x, in IEEE double as ECMAScript computes (a + b) / 2).
import { describe, expect, it } from 'vitest';
import { orderByX } from '../../../src/core/io/order-x.ts';
import { loadFile } from '../../../src/core/io/load.ts';
import type { LoadResult } from '../../../src/core/io/types.ts';
import { buildNetcdfClassic } from '../../fixtures/netcdf/netcdf-classic.mjs';

const arr = (a: ArrayLike<number>) => Array.from(a);

describe('orderByX', () => {
  it('leaves strictly ascending x alone, without a copy or a notice', () => {
    const x = Float64Array.from([1, 2, 3]);
    const y = Float64Array.from([5, 6, 7]);
    const r = orderByX(x, [y]);
    expect(r.x).toBe(x);
    expect(r.ys[0]).toBe(y);
    expect(r.notices).toEqual([]);
  });

  it('sorts stably, averages each set of equal x, ignores NaN gaps, and does not change its input', () => {
    const x = [3, 1, 2, 1, 3, 3];
    const y = [30, 10, 20, 12, NaN, 36];
    const r = orderByX(x, [y, [NaN, 1, 2, NaN, 3, 4]]);
    expect(arr(r.x)).toEqual([1, 2, 3]);
    expect(arr(r.ys[0])).toEqual([11, 20, 33]); // (10 + 12)/2; (30 + 36)/2, the NaN left out
    expect(arr(r.ys[1])).toEqual([1, 2, 3.5]); // x = 1: only one number
    expect(x).toEqual([3, 1, 2, 1, 3, 3]);
    expect(y.slice(4, 5)).toEqual([NaN]);
    expect(r.notices).toEqual([
      'x was not in ascending order (at point 2 as read it falls from 3 to 1), so the points were sorted by x; points with equal x keep the order read.',
      '3 points repeat an x value already present, in 2 sets (first: x = 1 at points 2 and 4 as read); y was averaged over each set of equal x, since a trace needs x strictly rising.',
    ]);
  });

  it('says "descending" for x written high to low and names the subject when given', () => {
    const r = orderByX([4000, 3900, 3800], [[1, 2, 3]], 'block 2');
    expect(arr(r.x)).toEqual([3800, 3900, 4000]);
    expect(arr(r.ys[0])).toEqual([3, 2, 1]);
    expect(r.notices).toEqual(['block 2: x was not in ascending order (it was written in descending order, 4000 to 3800), so the points were put in ascending order.']);
  });
});

describe('same data, same answer, whatever the format', () => {
  // Invented data: x out of order, 0.5 twice, 2 three times (one of them before the others).
  const X = [0, 0.5, 2, 0.5, 1, 1.5, 2, 2, 2.5, 3, 3.5];
  const Y = [1.25, 2.5, 7.75, 3, 4.5, 5.5, 8.25, 9, 6, 4.25, 2];
  const N = X.length;
  const EXPECT_X = [0, 0.5, 1, 1.5, 2, 2.5, 3, 3.5];
  const EXPECT_Y = [1.25, 2.75, 4.5, 5.5, 8.333333333333334, 6, 4.25, 2]; // (2.5 + 3)/2; (7.75 + 8.25 + 9)/3
  const ORDER_NOTICES = [
    'x was not in ascending order (at point 4 as read it falls from 2 to 0.5), so the points were sorted by x; points with equal x keep the order read.',
    '3 points repeat an x value already present, in 2 sets (first: x = 0.5 at points 2 and 4 as read); y was averaged over each set of equal x, since a trace needs x strictly rising.',
  ];

  const csv = new TextEncoder().encode(['Time (min),Signal (mV)', ...X.map((x, i) => `${x},${Y[i]}`)].join('\n') + '\n');
  const jcamp = new TextEncoder().encode(
    [
      '##TITLE=repeated x',
      '##JCAMP-DX=5.01',
      '##DATA TYPE=UV/VIS SPECTRUM',
      '##XUNITS=MINUTES',
      '##YUNITS=MILLIVOLTS',
      `##NPOINTS=${N}`,
      '##XYPOINTS=(XY..XY)',
      ...X.map((x, i) => `${x}, ${Y[i]}`),
      '##END=',
    ].join('\n') + '\n',
  );
  const netcdf = buildNetcdfClassic({
    dims: [{ name: 'point_number', size: N }],
    attrs: [
      { name: 'retention_unit', value: 'Minutes' },
      { name: 'detector_unit', value: 'mV' },
    ],
    vars: [
      { name: 'actual_sampling_interval', dims: [], type: 'double', values: [0.5] },
      { name: 'actual_delay_time', dims: [], type: 'double', values: [0] },
      { name: 'raw_data_retention', dims: [0], type: 'double', values: X },
      { name: 'ordinate_values', dims: [0], type: 'double', values: Y },
    ],
  });

  const loaded = (r: LoadResult) => {
    if (!r.ok) throw new Error(`expected a load, got: ${r.error.problem}`);
    expect(r.traces).toHaveLength(1);
    return { trace: r.traces[0], notices: r.report.notices };
  };
  const files: [string, Uint8Array][] = [
    ['repeated.csv', csv],
    ['repeated.jdx', jcamp],
    ['repeated.cdf', netcdf],
  ];

  for (const [name, bytes] of files) {
    it(`${name}: sorted, repeated x averaged, and the two sentences said`, () => {
      const { trace, notices } = loaded(loadFile(bytes, name));
      expect(arr(trace.x)).toEqual(EXPECT_X);
      expect(arr(trace.y)).toEqual(EXPECT_Y);
      expect(notices.filter((s) => /ascending order|repeat an x value/.test(s))).toEqual(ORDER_NOTICES);
    });
  }

  it('the three formats give identical arrays and identical order sentences', () => {
    const all = files.map(([name, bytes]) => loaded(loadFile(bytes, name)));
    for (const other of all.slice(1)) {
      expect(arr(other.trace.x)).toEqual(arr(all[0].trace.x));
      expect(arr(other.trace.y)).toEqual(arr(all[0].trace.y));
      const pick = (n: string[]) => n.filter((s) => ORDER_NOTICES.includes(s));
      expect(pick(other.notices)).toEqual(pick(all[0].notices));
    }
  });
});
