// Shared set-up for the page's own test files (test/ui/**): the app's store
// put back to its first state, the invented demo's sample (public/demo,
// made by scripts/make-demo.mjs) loaded through the page's service and
// analysed in this thread, and a component rendered to static markup
// without a browser (react-dom/server).
import { readFileSync } from 'node:fs';
import { createElement, isValidElement, type FunctionComponent, type ReactElement, type ReactNode } from 'react';
import { renderToStaticMarkup } from 'react-dom/server';
import { useApp } from '../../src/state/store.ts';
import { analyseTrace, getBackend, loadBytes } from '../../src/state/service.ts';

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
