// Shared set-up for the page's own test files (test/ui/**): the app's store
// put back to its first state, the invented demo's sample (public/demo,
// made by scripts/make-demo.mjs) loaded through the page's service and
// analysed in this thread, and a component rendered to static markup
// without a browser (react-dom/server).
import { readFileSync } from 'node:fs';
import { createElement, isValidElement, type FunctionComponent, type ReactElement, type ReactNode } from 'react';
import { renderToStaticMarkup } from 'react-dom/server';
import type { Peak } from '../../src/core/measure/peak-types.ts';
import { useApp } from '../../src/state/store.ts';
import { emptyStandards, withAmount, withUnit } from '../../src/ui/calibration/standards-edit.ts';
import { analyseTrace, getBackend, loadBytes } from '../../src/state/service.ts';
import { WindowedTable, type WindowedTableProps } from '../../src/ui/WindowedTable.tsx';

export const demoBytes = (name: string): Uint8Array => new Uint8Array(readFileSync(new URL(`../../public/demo/${name}`, import.meta.url)));

// react-dom/server reads a zustand store through its server snapshot, which
// is the store's first-state object (zustand 5, react.mjs: useStore gives
// useSyncExternalStore `() => selector(api.getInitialState())`). A test sets
// the state and renders once, so here that object is kept equal to the
// state now; a copy of the first state is kept for resetStore.
const SNAPSHOT = useApp.getInitialState();
const FIRST = { ...SNAPSHOT };
useApp.subscribe((s) => { Object.assign(SNAPSHOT, s); });

/** The app's store as it is when the page opens (replacing every field). */
export function resetStore(): void {
  useApp.setState(FIRST, true);
}

/** Load the demo sample (and optionally its blank) and put its whole analysis in the store. */
export async function loadDemoSample(opts: { blank?: boolean } = {}): Promise<void> {
  if (!await loadBytes(demoBytes('demo-sample.csv'), 'demo-sample.csv')) throw new Error('demo sample did not load');
  if (opts.blank && !await loadBytes(demoBytes('demo-blank.csv'), 'demo-blank.csv', { roles: ['blank'] })) throw new Error('demo blank did not load');
  await analyseNow();
}

/** The demo sample under a moving average `window` points wide (the only step of the stack), analysed. */
export async function loadDemoSmoothed(window: number): Promise<void> {
  await loadDemoSample();
  useApp.getState().addStep('moving-average');
  useApp.getState().setParam(useApp.getState().recipe.steps[0].uid, 'window', window);
  await analyseNow();
}

/** Analyse the current sample with the store's settings and put the result in the store. */
export async function analyseNow(): Promise<void> {
  const s = useApp.getState();
  if (!s.sampleId) throw new Error('no sample');
  getBackend().setInputs(s.traces); // what the page's controller does when the traces change
  const blank = s.traces.find((t) => s.roles[t.id] === 'blank');
  const result = await analyseTrace({
    sampleId: s.sampleId, blankId: blank?.id, scanIds: s.traces.filter((t) => s.roles[t.id] === 'scan').map((t) => t.id),
    recipe: s.recipe, showUid: s.showUid, noise: s.noiseSettings, peaks: s.peakSettings, decisions: s.decisions,
    alternatives: s.alternatives, ledgerNoiseLevel: s.ledgerNoiseLevel,
  });
  useApp.getState().setResult(result);
}

/** Static HTML of a component with props (what the page shows before any interaction). */
export function html<P extends object>(c: FunctionComponent<P>, props: P = {} as P): string {
  return renderToStaticMarkup(createElement(c, props));
}

/**
 * The visible text of static markup: tags dropped (each as a space, or
 * with `inline` the tags of running text (strong, em, code, kbd) as
 * nothing), entities read, white space folded.
 */
export function text(markup: string, inline = false): string {
  const m = inline ? markup.replace(/<\/?(strong|em|code|kbd)(\s[^>]*)?>/g, '') : markup;
  return m.replace(/<[^>]+>/g, ' ').replace(/&amp;/g, '&').replace(/&lt;/g, '<').replace(/&gt;/g, '>').replace(/&quot;/g, '"').replace(/&#x27;/g, "'").replace(/\s+/g, ' ').trim();
}

/**
 * The element tree a component returns for the store now, its hooks run in a
 * probe rendered once. Its buttons' handlers are the component's own, so a
 * test can press them (see {@link press}) without a browser; nested
 * components stay unrendered elements in the tree.
 */
export function tree<P extends object>(c: (props: P) => ReactNode, props: P = {} as P): ReactNode {
  let out: ReactNode = null;
  const Probe = () => { out = c(props); return null; };
  renderToStaticMarkup(createElement(Probe));
  return out;
}

type El = ReactElement<Record<string, unknown> & { children?: ReactNode }>;

/** Every element of a tree (depth first). */
export function elements(node: ReactNode): El[] {
  const out: El[] = [];
  const walk = (n: ReactNode): void => {
    if (Array.isArray(n)) { n.forEach(walk); return; }
    if (!isValidElement(n)) return;
    const e = n as El;
    out.push(e);
    walk(e.props.children);
  };
  walk(node);
  return out;
}

/**
 * A tree with every row of its windowed tables (src/ui/WindowedTable.tsx) beside
 * it: such a table draws only the rows in its scrolled box, and stays an
 * unrendered element in {@link tree}; here each row is made by the table's own
 * `row` function, as it is when the box is scrolled to it.
 */
export function withAllRows(node: ReactNode): ReactNode[] {
  const tables = elements(node).filter((e) => e.type === WindowedTable).map((e) => e.props as unknown as WindowedTableProps);
  return [node, ...tables.flatMap((p) => p.keys.map((k, i) => p.row(i, { 'aria-rowindex': (p.rowIndex ?? ((j: number) => j + 2))(i), 'data-row-key': k })))];
}

/** The text inside an element of a tree (strings and numbers only). */
export function textOf(node: ReactNode): string {
  if (node === null || node === undefined || typeof node === 'boolean') return '';
  if (typeof node === 'string' || typeof node === 'number') return String(node);
  if (Array.isArray(node)) return node.map(textOf).join('');
  if (isValidElement(node)) return textOf((node as El).props.children);
  return '';
}

/** The button whose text (or aria-label) is `label`; throws when there is none, so a missing control fails the test. */
export function button(node: ReactNode, label: string | RegExp): El {
  const hit = elements(node).find((e) => e.type === 'button' && [textOf(e), String(e.props['aria-label'] ?? '')].some((t) => (typeof label === 'string' ? t === label : label.test(t))));
  if (!hit) throw new Error(`no button ${String(label)}`);
  return hit;
}

/** Press a button of the tree: its own onClick, with a stand-in event. */
export function press(node: ReactNode, label: string | RegExp): void {
  const b = button(node, label);
  if (b.props.disabled) throw new Error(`button ${String(label)} is disabled`);
  (b.props.onClick as (e: unknown) => void)({ preventDefault() {}, stopPropagation() {}, currentTarget: {}, target: {} });
}

/**
 * Invented standards for the calibration panels: the demo sample, one named
 * peak "Lagoon Blue" at its large peak (4.3 min), and four standards whose
 * areas are 2 × amount plus a small made-up scatter. Returns the amounts and
 * areas, for a least-squares line computed in the test itself.
 */
export async function calibrationSetup(): Promise<{ amounts: number[]; areas: number[] }> {
  await loadDemoSample();
  const s0 = useApp.getState();
  s0.setNamedPeaks({ ...s0.namedPeaks, peaks: [{ name: 'Lagoon Blue', position: 4.3, window: 0.05 }], xUnit: 'min' });
  s0.setCalibrationSettings({ model: 'line' });
  const amounts = [1, 2, 4, 8];
  const scatter = [0.01, -0.02, 0.015, -0.005];
  const areas = amounts.map((a, i) => 2 * a + scatter[i]);
  let table = withUnit(emptyStandards(['Lagoon Blue']), 'Lagoon Blue', 'mg/L');
  for (let i = 0; i < amounts.length; i++) {
    await loadBytes(demoBytes('demo-blank.csv'), `s${i + 1}.csv`, { roles: ['standard'], quiet: true });
    table = withAmount(table, `s${i + 1}.csv`, 'Lagoon Blue', amounts[i]);
  }
  useApp.getState().setStandardsTable(table);
  const s = useApp.getState();
  const std = s.traces.filter((t) => s.roles[t.id] === 'standard');
  useApp.getState().setStandardPeaks(Object.fromEntries(std.map((t, i) => [t.id, { ok: true as const, peaks: [{ x: 4.3, height: amounts[i], area: areas[i], fwhm: 0.2 } as unknown as Peak] }])));
  return { amounts, areas };
}

/** Ordinary least-squares line y = a + b x with its residual SD (n − 2 degrees of freedom), from the textbook formulas. */
export function olsLine(x: number[], y: number[]): { a: number; b: number; sy: number } {
  const n = x.length, mx = x.reduce((s, v) => s + v, 0) / n, my = y.reduce((s, v) => s + v, 0) / n;
  const sxx = x.reduce((s, v) => s + (v - mx) ** 2, 0), sxy = x.reduce((s, v, i) => s + (v - mx) * (y[i] - my), 0);
  const b = sxy / sxx, a = my - b * mx;
  const ssr = x.reduce((s, v, i) => s + (y[i] - a - b * v) ** 2, 0);
  return { a, b, sy: Math.sqrt(ssr / (n - 2)) };
}
