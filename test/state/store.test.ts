import { describe, expect, it } from 'vitest';
import { createAppStore } from '../../src/state/store.ts';
import { createTrace } from '../../src/core/trace.ts';
import { STEP_REGISTRY } from '../../src/core/steps/registry.ts';

const report = { fileName: 'a.csv', sha256: '0'.repeat(64), format: 'test', rowsRead: 5, skipped: [], notices: [], metadata: {} };
const mk = (name: string) => createTrace({ name, x: [0, 1, 2, 3, 4], y: [1, 2, 3, 2, 1], source: { fileName: name, sha256: '0'.repeat(64), rowsRead: 5, rowsSkipped: 0 } });

// Fresh store per test (zustand testing guide).
describe('store', () => {
  it('every stack edit can be undone and redone', () => {
    const useApp = createAppStore();
    const ids = STEP_REGISTRY.slice(0, 2).map((d) => d.id);
    expect(ids.length).toBe(2);
    const s = useApp.getState();
    s.addStep(ids[0]);
    s.addStep(ids[1]);
    const [a, b] = useApp.getState().recipe.steps;
    useApp.getState().moveStep(0, 1);
    expect(useApp.getState().recipe.steps.map((x) => x.uid)).toEqual([b.uid, a.uid]);
    useApp.getState().toggleStep(a.uid);
    expect(useApp.getState().recipe.steps[1].enabled).toBe(false);
    useApp.getState().removeStep(b.uid);
    expect(useApp.getState().recipe.steps.length).toBe(1);
    for (let i = 0; i < 5; i++) useApp.getState().undo();
    expect(useApp.getState().recipe.steps.length).toBe(0);
    for (let i = 0; i < 5; i++) useApp.getState().redo();
    expect(useApp.getState().recipe.steps.map((x) => [x.uid, x.enabled])).toEqual([[a.uid, false]]);
  });

  it('a parameter edit is one undo step and does not touch the previous recipe', () => {
    const useApp = createAppStore();
    const def = STEP_REGISTRY.find((d) => d.params.some((p) => p.kind === 'int'))!;
    const key = def.params.find((p) => p.kind === 'int')!.key;
    useApp.getState().addStep(def.id);
    const before = useApp.getState().recipe;
    const uid = before.steps[0].uid;
    const old = before.steps[0].params[key];
    useApp.getState().setParam(uid, key, (old as number) + 2);
    expect(before.steps[0].params[key]).toBe(old);
    useApp.getState().undo();
    expect(useApp.getState().recipe.steps[0].params[key]).toBe(old);
  });

  it('one sample at a time; a new sample sets the old one aside but keeps it', () => {
    const useApp = createAppStore();
    const t1 = mk('one'), t2 = mk('two');
    useApp.getState().addTraces([t1], report);
    useApp.getState().addTraces([t2], report);
    const s = useApp.getState();
    expect(s.sampleId).toBe(t2.id);
    expect(s.roles[t1.id]).toBe('ignore');
    expect(s.traces.length).toBe(2);
    useApp.getState().setRole(t1.id, 'blank');
    useApp.getState().setRole(t2.id, 'blank');
    expect(useApp.getState().roles[t1.id]).toBe('ignore'); // only one blank
  });
});
