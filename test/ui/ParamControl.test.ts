import { beforeEach, describe, expect, it } from 'vitest';
import type { ParamSpec, ParamValue } from '../../src/core/steps/types.ts';
import { stepDefinition } from '../../src/core/steps/registry.ts';
import { useApp } from '../../src/state/store.ts';
import { ParamControl } from '../../src/ui/ParamControl.tsx';
import { elements, html, press, resetStore, text, tree } from './harness.ts';

// src/ui/ParamControl.tsx: a step parameter as slider and typed value;
// invalid typing is never applied. (What the field shows after a bad value
// is component state, which static rendering does not re-render; here:
// that a bad value never reaches the step, through the control's own handlers.)
beforeEach(() => resetStore());
const spec = (step: string, key: string): ParamSpec => stepDefinition(step)!.params.find((p) => p.key === key)!;
function control(s: ParamSpec, value: ParamValue, dx: number | null = 0.01, xUnit = 'min') {
  const got: ParamValue[] = [];
  const props = { spec: s, value, dx, xUnit, onChange: (v: ParamValue) => { got.push(v); } };
  return { got, props, node: tree(ParamControl, props) };
}
const typed = (node: ReturnType<typeof tree>, raw: string) => {
  const input = elements(node).find((e) => e.type === 'input' && e.props.type === 'text')!;
  (input.props.onBlur as (e: unknown) => void)({ target: { value: raw } });
};

describe('ParamControl, a window in points', () => {
  const win = spec('moving-average', 'window');
  it('label with its unit, and the width in x-units from the spacing', () => {
    const t = text(html(ParamControl, { spec: win, value: 5, dx: 0.01, xUnit: 'min', onChange: () => {} }));
    expect(t).toContain('Window (points)');
    expect(t).toContain('= 0.05 min'); // 5 points × 0.01 min
    expect(text(html(ParamControl, { spec: win, value: 5, dx: 0.01, xUnit: '', onChange: () => {} }))).toContain('= 0.05 x-units');
  });
  it('a typed valid value is applied (comma as decimal mark read too); an even, out-of-range or empty one is not', () => {
    const c = control(win, 5);
    typed(c.node, '7');
    typed(c.node, '8');
    typed(c.node, '1');
    typed(c.node, '');
    typed(c.node, 'abc');
    expect(c.got).toEqual([7]);
    const d = control(spec('baseline', 'p'), 0.01);
    typed(d.node, '0,02');
    expect(d.got).toEqual([0.02]);
  });
  it('the slider moves in odd steps: an even value from it is made odd', () => {
    const c = control(win, 5);
    const slider = elements(c.node).find((e) => e.type === 'input' && e.props.type === 'range')!;
    expect(slider.props.step).toBe(2);
    (slider.props.onChange as (e: unknown) => void)({ target: { value: '10' } });
    expect(c.got).toEqual([11]);
  });
});

describe('ParamControl, other kinds', () => {
  it('a log-scaled number: the slider works in log10 and gives three significant digits back', () => {
    const c = control(spec('baseline', 'lambda'), 1e5);
    const slider = elements(c.node).find((e) => e.type === 'input' && e.props.type === 'range')!;
    expect([slider.props.min, slider.props.max, slider.props.value]).toEqual([2, 9, 5]);
    (slider.props.onChange as (e: unknown) => void)({ target: { value: '6.5' } });
    expect(c.got).toEqual([3160000]); // 10^6.5 = 3162277.66… to three digits
  });
  it('a choice lists every choice of the spec, the current one selected', () => {
    const s = spec('baseline', 'method');
    if (s.kind !== 'choice') throw new Error('spec');
    const h = html(ParamControl, { spec: s, value: s.choices[1].value, dx: 0.01, xUnit: 'min', onChange: () => {} });
    expect(h.match(/<option /g)).toHaveLength(s.choices.length);
    expect(h).toContain(`<option value="${s.choices[1].value}" selected="">`);
  });
  it('ranges: listed with remove buttons; “Add the marked x-range” disabled until a range is marked, then adds it', () => {
    const s = spec('baseline', 'ranges');
    const none = control(s, []);
    expect(text(html(ParamControl, none.props))).toContain('Baseline ranges (min) No ranges yet.');
    expect(text(html(ParamControl, none.props))).toContain('Switch on “Mark a range” above the plot');
    expect(() => press(none.node, 'Add the marked x-range')).toThrow(/disabled/);
    useApp.getState().setMarkedRange([1, 2]);
    const two = control(s, [[0, 0.5], [9, 10]]);
    press(two.node, 'Add the marked x-range');
    press(two.node, 'Remove range 0 to 0.5');
    expect(two.got).toEqual([[[0, 0.5], [9, 10], [1, 2]], [[9, 10]]]);
  });
});
