/**
 * src/state/inputs-slice.ts on a fresh store each: traces and their roles,
 * one sample and one blank at a time (the others set aside, never dropped),
 * axis names, removal. Properties of the slice's own definition.
 */
import { describe, expect, it } from 'vitest';
import { createTrace } from '../../src/core/trace.ts';
import { createAppStore } from '../../src/state/store.ts';

const report = { fileName: 'a.csv', sha256: '0'.repeat(64), format: 'test', rowsRead: 5, skipped: [], notices: [], metadata: {} };
const mk = (name: string) => createTrace({ name, x: [0, 1, 2, 3, 4], y: [1, 2, 3, 2, 1], source: { fileName: name, sha256: '0'.repeat(64), rowsRead: 5, rowsSkipped: 0 } });

describe('inputs slice', () => {
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

  it('a file of several traces: the first is the sample, the rest set aside, each with the file’s load report', () => {
    const app = createAppStore();
    const ts = [mk('a'), mk('b'), mk('c')];
    app.getState().addTraces(ts, report);
    const s = app.getState();
    expect(s.sampleId).toBe(ts[0].id);
    expect(ts.map((t) => s.roles[t.id])).toEqual(['sample', 'ignore', 'ignore']);
    for (const t of ts) expect(s.reports[t.id]).toBe(report);
  });

  it('traces of several files in one change: each keeps its own file’s load report (one report per trace)', () => {
    const app = createAppStore();
    const ts = [mk('a'), mk('b')];
    const other = { ...report, fileName: 'b.csv', sha256: '1'.repeat(64) };
    let changes = 0;
    app.subscribe((s, prev) => { if (s.traces !== prev.traces) changes += 1; });
    app.getState().addTraces(ts, [report, other], { roles: ['sample', 'blank'] });
    const s = app.getState();
    expect(changes).toBe(1);
    expect(s.reports[ts[0].id]).toBe(report);
    expect(s.reports[ts[1].id]).toBe(other);
    expect(ts.map((t) => s.roles[t.id])).toEqual(['sample', 'blank']);
  });

  it('roles given with the traces are taken; replace drops what was there', () => {
    const app = createAppStore();
    const old = mk('old');
    app.getState().addTraces([old], report);
    const s1 = mk('s'), b1 = mk('b');
    app.getState().addTraces([b1, s1], report, { replace: true, roles: ['blank', 'sample'] });
    const s = app.getState();
    expect(s.traces.map((t) => t.id)).toEqual([b1.id, s1.id]);
    expect(s.roles).toEqual({ [b1.id]: 'blank', [s1.id]: 'sample' });
    expect(s.sampleId).toBe(s1.id);
    expect(s.reports[old.id]).toBeUndefined();
  });

  it('setRole: the sample that stops being one leaves no sample; a new sample sets the old one aside', () => {
    const app = createAppStore();
    const a = mk('a'), b = mk('b');
    app.getState().addTraces([a, b], report);
    app.getState().setRole(b.id, 'sample');
    expect(app.getState()).toMatchObject({ sampleId: b.id, roles: { [a.id]: 'ignore', [b.id]: 'sample' } });
    app.getState().setRole(b.id, 'scan');
    expect(app.getState().sampleId).toBeNull();
    app.getState().setSample(a.id);
    expect(app.getState()).toMatchObject({ sampleId: a.id, roles: { [a.id]: 'sample', [b.id]: 'scan' } });
  });

  it('setRoles: several roles in one change, still one sample and one blank (the one just given wins)', () => {
    const app = createAppStore();
    const [a, b, c, d] = [mk('a'), mk('b'), mk('c'), mk('d')];
    app.getState().addTraces([a, b, c, d], report);
    app.getState().setRoles({ [b.id]: 'sample', [c.id]: 'blank', [d.id]: 'scan' });
    expect(app.getState().sampleId).toBe(b.id);
    expect(app.getState().roles).toEqual({ [a.id]: 'ignore', [b.id]: 'sample', [c.id]: 'blank', [d.id]: 'scan' });
    app.getState().setRoles({ [a.id]: 'blank' });
    expect(app.getState().roles[a.id]).toBe('blank');
    expect(app.getState().roles[c.id]).toBe('ignore');
    // An explicit sample id that does not hold the sample role leaves no sample.
    app.getState().setRoles({}, a.id);
    expect(app.getState().sampleId).toBeNull();
  });

  it('naming axes replaces the trace with one of the same id, data and source; the old trace object is untouched', () => {
    const app = createAppStore();
    const t = mk('t');
    app.getState().addTraces([t], report);
    app.getState().setAxisNames(t.id, { xName: 'Time', xUnit: 'min', yName: 'Absorbance', yUnit: 'mAU' });
    const n = app.getState().traces[0];
    expect(n).not.toBe(t);
    expect(n).toMatchObject({ id: t.id, xName: 'Time', xUnit: 'min', yName: 'Absorbance', yUnit: 'mAU' });
    expect(n.x).toBe(t.x);
    expect(n.y).toBe(t.y);
    expect(n.source).toBe(t.source);
    expect(Object.isFrozen(n)).toBe(true);
    expect(t.xName).not.toBe('Time');
  });

  it('removing the sample leaves no sample and drops its role; loading progress is set and cleared', () => {
    const app = createAppStore();
    const a = mk('a'), b = mk('b');
    app.getState().addTraces([a, b], report);
    app.getState().removeTrace(a.id);
    expect(app.getState().traces.map((t) => t.id)).toEqual([b.id]);
    expect(app.getState().sampleId).toBeNull();
    expect(a.id in app.getState().roles).toBe(false);
    app.getState().setLoading({ fileName: 'x.csv', fraction: 0.5 });
    expect(app.getState().loading).toEqual({ fileName: 'x.csv', fraction: 0.5 });
    app.getState().setLoading(null);
    expect(app.getState().loading).toBeNull();
  });
});
