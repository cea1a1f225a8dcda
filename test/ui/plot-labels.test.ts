import { describe, expect, it } from 'vitest';
import { labelBox, placeLabels, type LabelItem } from '../../src/ui/plot-labels.ts';
import { makeRng } from '../../src/core/numeric/random.ts';

// Issue 17: labels on the plot never overlap; which are kept follows the priority.
describe('placeLabels', () => {
  it('keeps the higher priority label where two collide, and moves a neighbour beside its apex when that is free', () => {
    const at = (px: number, py: number, priority: number): LabelItem => ({ px, py, text: '12', priority });
    expect(placeLabels([at(200, 100, 1), at(200, 100, 3), at(200, 100, 2)], 400, 300).map((k) => [k.index, k.spot])).toEqual([[1, 'top center']]);
    // A lower neighbour 10 px to the right whose top spot is taken by the first label: placed to its right.
    expect(placeLabels([at(200, 100, 2), at(210, 110, 1)], 400, 300).map((k) => k.spot)).toEqual(['top center', 'middle right']);
  });

  it('never keeps two overlapping boxes nor a box outside the plotting area (2,000 random labels)', () => {
    const rng = makeRng(5);
    const items: LabelItem[] = Array.from({ length: 2000 }, () => ({ px: rng.uniform() * 800, py: rng.uniform() * 350, text: (rng.uniform() * 500).toFixed(1), priority: rng.uniform() }));
    const kept = placeLabels(items, 800, 350);
    expect(kept.length).toBeGreaterThan(20);
    for (const k of kept) {
      expect(k.box).toEqual(labelBox(items[k.index], k.spot));
      expect(k.box.left).toBeGreaterThanOrEqual(0);
      expect(k.box.right).toBeLessThanOrEqual(800);
      expect(k.box.top).toBeGreaterThanOrEqual(0);
      expect(k.box.bottom).toBeLessThanOrEqual(350);
    }
    for (let a = 0; a < kept.length; a++) {
      for (let b = a + 1; b < kept.length; b++) {
        const p = kept[a].box, q = kept[b].box;
        expect(p.left < q.right && q.left < p.right && p.top < q.bottom && q.top < p.bottom).toBe(false);
      }
    }
  });

  it('a label at the top edge goes beside its apex instead of being dropped', () => {
    const got = placeLabels([{ px: 100, py: 12, text: '350', priority: 1 }], 400, 300);
    expect(got.map((k) => k.spot)).toEqual(['middle right']);
  });
});
