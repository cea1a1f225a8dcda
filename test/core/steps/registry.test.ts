import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { STEP_REGISTRY, stepDefinition } from '../../../src/core/steps/registry.ts';

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


describe('the step registry', () => {
  it('lists every step file in src/core/steps exactly once, ids unique (the registry is the one list)', () => {
    // Files that are not steps: the shared shapes, the shared checks and this list.
    const notSteps = new Set(['types.ts', 'checks.ts', 'registry.ts']);
    const stepFiles = readdirSync('src/core/steps').filter((f) => f.endsWith('.ts') && !notSteps.has(f));
    expect(STEP_REGISTRY.length).toBe(stepFiles.length);
    const ids = STEP_REGISTRY.map((d) => d.id);
    expect(new Set(ids).size).toBe(ids.length);
    const labels = STEP_REGISTRY.map((d) => d.label);
    expect(new Set(labels).size).toBe(labels.length);
    // Each step's id is the name of its file (DESIGN.md: one file per step).
    expect([...ids].sort()).toEqual(stepFiles.map((f) => f.replace(/\.ts$/, '')).sort());
  });

  it('every parameter declares its kind and unit, defaults give every key, numeric ranges are ordered', () => {
    const kinds = new Set(['int', 'number', 'choice', 'boolean', 'ranges']);
    for (const d of STEP_REGISTRY) {
      for (const p of d.params) {
        expect(kinds.has(p.kind), `${d.id}.${p.key}`).toBe(true);
        expect(typeof p.unit, `${d.id}.${p.key}`).toBe('string');
        expect(p.key in d.defaults, `${d.id}: default for ${p.key}`).toBe(true);
        if (p.kind === 'int' || p.kind === 'number') expect(p.min, `${d.id}.${p.key}`).toBeLessThan(p.max);
        if (p.kind === 'choice') expect(p.choices.map((c) => c.value), `${d.id}.${p.key}`).toContain(d.defaults[p.key]);
      }
    }
  });

  it('a window parameter, where a step has one, is a whole, odd number of points', () => {
    const withWindow = STEP_REGISTRY.filter((d) => d.params.some((p) => p.key === 'window'));
    // Savitzky–Golay, moving average, local-order fit and despiking work on sliding windows.
    expect(withWindow.map((d) => d.id).sort()).toEqual(['despike', 'local-order', 'moving-average', 'savitzky-golay']);
    for (const d of withWindow) {
      const w = d.params.find((p) => p.key === 'window')!;
      expect(w.kind).toBe('int');
      expect(w.unit).toBe('points');
      if (w.kind === 'int') expect(w.odd).toBe(true);
      expect(Number(d.defaults.window) % 2).toBe(1);
    }
  });

  it('stepDefinition finds each step by id and nothing for an unknown id', () => {
    for (const d of STEP_REGISTRY) expect(stepDefinition(d.id)).toBe(d);
    expect(stepDefinition('no-such-step')).toBeUndefined();
    expect(stepDefinition('')).toBeUndefined();
  });
});
