import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { STEP_REGISTRY } from '../../../src/core/steps/registry.ts';
import { trimStep } from '../../../src/core/steps/trim.ts';

// Issue 17: every message that advises a step names one the step menu has.
function files(dir: string): string[] {
  return readdirSync(dir).flatMap((f) => { const p = join(dir, f); return statSync(p).isDirectory() ? files(p) : /\.tsx?$/.test(f) ? [p] : []; });
}

describe('advice names steps that exist', () => {
  it('each step named in quotes in a message ("… the “X” step") is a label in the step registry', () => {
    const labels = new Set(STEP_REGISTRY.map((d) => d.label));
    const advised: { file: string; label: string }[] = [];
    for (const f of [...files('src/core'), ...files('src/ui')]) {
      const text = readFileSync(f, 'utf8');
      for (const m of text.matchAll(/the ["“]([^"”]{3,60})["”] step/g)) advised.push({ file: f, label: m[1] });
    }
    // The blank refusal and the uneven-spacing refusal at least (so the scan cannot pass by finding nothing).
    expect(advised.map((a) => a.label)).toEqual(expect.arrayContaining(['Keep an x-range (trim)', 'Resample to even spacing']));
    for (const a of advised) expect(labels.has(a.label), `${a.file}: "${a.label}"`).toBe(true);
  });
});

describe('trim: keep one x-range', () => {
  const x = Float64Array.from({ length: 11 }, (_, i) => i * 0.5);
  const y = Float64Array.from(x, (v) => v * v);
  it('keeps exactly the points inside the range, unchanged, and leaves the input alone', () => {
    const before = Float64Array.from(y);
    expect(trimStep.validate({ range: [[1, 3.2]] }, { x, y }, {})).toBeNull();
    const out = trimStep.apply({ x, y }, { range: [[3.2, 1]] }, {});
    expect(Array.from(out.x)).toEqual([1, 1.5, 2, 2.5, 3]);
    expect(Array.from(out.y)).toEqual([1, 2.25, 4, 6.25, 9]);
    expect(out.notes[0]).toBe('Kept 5 of 11 points, x = 1 to 3; 2 left out before and 4 after.');
    expect(y).toEqual(before);
  });
  it('says what is wrong with a missing, doubled or too short range', () => {
    expect(trimStep.validate({ range: [] }, { x, y }, {})).toMatch(/No x-range chosen yet/);
    expect(trimStep.validate({ range: [[0, 1], [2, 3]] }, { x, y }, {})).toMatch(/Only one range/);
    expect(trimStep.validate({ range: [[0, 1]] }, { x, y }, {})).toMatch(/holds 3 points of this trace \(it runs from 0 to 5\); a trace needs at least 5/);
  });
});
