import { createElement, type ReactNode } from 'react';
import { renderToStaticMarkup } from 'react-dom/server';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { lastDrawProblem } from '../../src/ui/draw-health.ts';
import { ErrorBoundary } from '../../src/ui/ErrorBoundary.tsx';
import { elements, textOf, text } from './harness.ts';

// src/ui/ErrorBoundary.tsx: a fault in one part stays in that part. React's
// server renderer has no error boundaries, so the class is driven through
// the methods React calls (getDerivedStateFromError, componentDidCatch,
// render) and its output rendered to static markup.
const map = new Map<string, string>();
beforeEach(() => {
  map.clear();
  vi.stubGlobal('localStorage', { getItem: (k: string) => map.get(k) ?? null, setItem: (k: string, v: string) => { map.set(k, v); }, removeItem: (k: string) => { map.delete(k); } });
  vi.spyOn(console, 'warn').mockImplementation(() => {});
});
afterEach(() => { vi.unstubAllGlobals(); vi.restoreAllMocks(); });

function failed(props: { area: string; drawsSession?: boolean; actions?: ReactNode }, error: Error) {
  const b = new ErrorBoundary({ ...props, children: createElement('p', null, 'the part') });
  b.state = ErrorBoundary.getDerivedStateFromError(error);
  return b;
}

describe('ErrorBoundary', () => {
  it('without an error it shows its children unchanged', () => {
    expect(renderToStaticMarkup(createElement(ErrorBoundary, { area: 'the plot', children: createElement('p', null, 'the part') }))).toBe('<p>the part</p>');
  });
  it('after an error: an alert naming the part and the message, saying the data and the rest of the page are unaffected, with Try again', () => {
    const b = failed({ area: 'the peak table' }, new Error('Cannot read properties of undefined'));
    const h = renderToStaticMarkup(createElement('div', null, b.render()));
    expect(h).toContain('role="alert"');
    expect(text(h)).toBe('The peak table stopped with an error “Cannot read properties of undefined”. Your data and the rest of the page are unaffected. Try again');
    expect(h).not.toContain('the part');
  });
  it('an error without a message is named by its kind', () => {
    const e = new TypeError('');
    expect(text(renderToStaticMarkup(createElement('div', null, failed({ area: 'the plot' }, e).render())))).toContain('“TypeError”');
  });
  it('Try again clears the error (the part is drawn again)', () => {
    const b = failed({ area: 'the plot' }, new Error('x'));
    let next: unknown = null;
    b.setState = ((s: unknown) => { next = s; }) as typeof b.setState;
    const tryAgain = elements(b.render()).find((e) => e.type === 'button' && textOf(e) === 'Try again')!;
    (tryAgain.props.onClick as () => void)();
    expect(next).toEqual({ error: null });
  });
  it('the part that draws the session remembers the failure across a reload (draw-health), naming the part; other parts do not', () => {
    failed({ area: 'the plot' }, new Error('bad axis')).componentDidCatch(new Error('bad axis'), { componentStack: '' });
    expect(lastDrawProblem()).toBeNull();
    failed({ area: 'the plot', drawsSession: true }, new Error('bad axis')).componentDidCatch(new Error('bad axis'), { componentStack: '' });
    expect(lastDrawProblem()).toMatchObject({ state: 'failed', message: 'the plot: bad axis' });
  });
  it('extra actions are offered beside Try again', () => {
    const b = failed({ area: 'the plot', actions: createElement('button', { type: 'button' }, 'Start without the saved session') }, new Error('x'));
    expect(text(renderToStaticMarkup(createElement('div', null, b.render())))).toMatch(/Try again Start without the saved session$/);
  });
});
