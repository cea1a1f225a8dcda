/**
 * What reaches the plot library is checked here first, because the library
 * cannot draw every set of doubles a file may hold: with values near the
 * largest double (about 1.8e308) its axis padding overflows and the lines
 * become NaN; with a whole axis within a few multiples of the smallest
 * double (5e-324) it throws while making ticks and the page went blank; with
 * a range a million-millionth of its own size every tick reads the same.
 *
 * So, per axis: values that are not finite are left out of the drawing (a
 * gap, counted in a note); an axis whose largest magnitude is above
 * {@link LARGE} or below {@link SMALL}, or whose span overflows, is drawn
 * divided by a power of ten; an axis whose span is below {@link RELATIVE}
 * of its magnitude is drawn as the distance from its first value. The axis
 * title and a note say so in words, and events from the plot (zoom, click,
 * selection) are turned back into data units by {@link toDataUnits}. The
 * data and every result stay as they are: only the drawing changes.
 *
 * Pure: no Plotly, no DOM, so it is tested in Node.
 */

/** A curve and a layout as the plot library takes them (the same shapes as in plotly.d.ts; no import, so Node tests need no library types). */
import type { PlotData, PlotLayout, PlotShape } from 'plotly.js-strict-dist-min';

/** Largest magnitude drawn as it is (the library drew 1e290 cleanly in Chromium; 1e308 gave NaN paths). */
export const LARGE = 1e290;
/** Smallest non-zero magnitude drawn as it is (1e-300 drew cleanly; 5e-324 threw). */
export const SMALL = 1e-290;
/** Span / magnitude below which the ticks cannot tell values apart (double precision is about 2.2e-16). */
export const RELATIVE = 1e-11;

/** How one axis is drawn: drawn = (value − offset) / 10^exponent. */
export interface AxisTransform {
  offset: number;
  exponent: number;
}

/** (value − offset) / 10^exponent, exact to a rounding even for subnormal values (scaled up by 1e300 first). */
export function toDrawn(value: number, tr: AxisTransform): number {
  const v = value - tr.offset;
  if (tr.exponent < -290) return (v * 1e300) / Number(`1e${tr.exponent + 300}`);
  return v / Number(`1e${tr.exponent}`);
}

export interface GuardedFigure {
  data: PlotData[];
  layout: PlotLayout;
  /** Per axis id ("x", "y", "y2", …), only for axes drawn other than as they are. */
  transforms: Record<string, AxisTransform>;
  /** Sentences for the page, one per change made for drawing. */
  notes: string[];
}

type Values = ArrayLike<number | null | undefined>;

/** "x" → "xaxis", "y2" → "yaxis2". */
function layoutKey(axis: string): string {
  return `${axis[0]}axis${axis.slice(1)}`;
}

function axisOf(trace: PlotData, letter: 'x' | 'y'): string {
  const v = trace[`${letter}axis`];
  return typeof v === 'string' && v.startsWith(letter) ? v : letter;
}

function isValues(v: unknown): v is Values {
  return Array.isArray(v) || ArrayBuffer.isView(v);
}

function exponentOf(m: number): number {
  return Math.floor(Math.log10(m));
}

function short(v: number): string {
  return Number(v.toPrecision(6)).toString();
}

function titleText(axisLayout: unknown): string {
  const t = (axisLayout as { title?: unknown } | undefined)?.title;
  if (typeof t === 'string') return t;
  if (t && typeof t === 'object' && typeof (t as { text?: unknown }).text === 'string') return (t as { text: string }).text;
  return '';
}

/** The transform for one axis from the range of its finite values, or null to draw as it is. */
export function axisTransform(lo: number, hi: number): AxisTransform | null {
  if (!(hi >= lo)) return null;
  const m = Math.max(Math.abs(lo), Math.abs(hi));
  if (m === 0) return null;
  const span = hi - lo;
  if (!Number.isFinite(span) || m > LARGE || m < SMALL) return { offset: 0, exponent: exponentOf(m) };
  if (span > 0 && span < m * RELATIVE) return { offset: lo, exponent: exponentOf(span) };
  return null;
}

/**
 * Check a figure before drawing (see the module comment). The input is
 * only read; arrays that need no change are passed on as they are.
 */
export function guardFigure(data: readonly PlotData[], layout: PlotLayout): GuardedFigure {
  const ranges = new Map<string, { lo: number; hi: number }>();
  const dropped = new Map<string, number>();
  const see = (axis: string, v: number) => {
    const r = ranges.get(axis);
    if (!r) ranges.set(axis, { lo: v, hi: v });
    else { if (v < r.lo) r.lo = v; if (v > r.hi) r.hi = v; }
  };
  for (const t of data) {
    for (const letter of ['x', 'y'] as const) {
      const vals = t[letter];
      if (!isValues(vals)) continue;
      const axis = axisOf(t, letter);
      for (let i = 0; i < vals.length; i++) {
        const v = vals[i];
        if (typeof v === 'number' && Number.isFinite(v)) see(axis, v);
      }
    }
  }
  const transforms: Record<string, AxisTransform> = {};
  for (const [axis, r] of ranges) {
    const tr = axisTransform(r.lo, r.hi);
    if (tr) transforms[axis] = tr;
  }

  const out: PlotData[] = data.map((t) => {
    let copy: PlotData | null = null;
    for (const letter of ['x', 'y'] as const) {
      const vals = t[letter];
      if (!isValues(vals)) continue;
      const axis = axisOf(t, letter);
      const tr = transforms[axis];
      let bad = 0;
      for (let i = 0; i < vals.length; i++) {
        const v = vals[i];
        if (typeof v === 'number' && !Number.isFinite(v)) bad++;
      }
      if (!tr && bad === 0) continue;
      const fixed: (number | null)[] = new Array<number | null>(vals.length);
      for (let i = 0; i < vals.length; i++) {
        const v = vals[i];
        if (typeof v !== 'number' || !Number.isFinite(v)) fixed[i] = null;
        else fixed[i] = tr ? toDrawn(v, tr) : v;
      }
      if (bad > 0) {
        const name = typeof t.name === 'string' && t.name ? `“${t.name}”` : 'a curve';
        const key = `${name} ${letter}`;
        dropped.set(key, (dropped.get(key) ?? 0) + bad);
      }
      copy = copy ?? { ...t };
      copy[letter] = fixed;
    }
    return copy ?? t;
  });

  const notes: string[] = [];
  for (const [key, n] of dropped) {
    notes.push(`${n} ${key} value${n === 1 ? ' is' : 's are'} not a finite number (an overflow, NaN or infinity) and ${n === 1 ? 'is' : 'are'} left out of the drawing as a gap.`);
  }
  const outLayout: PlotLayout = { ...layout };
  for (const [axis, tr] of Object.entries(transforms)) {
    const key = layoutKey(axis);
    const a = { ...((layout[key] as Record<string, unknown> | undefined) ?? {}) };
    const title = titleText(a);
    const how = tr.offset !== 0
      ? `drawn as the distance from ${short(tr.offset)}${tr.exponent !== 0 ? `, divided by 1e${tr.exponent}` : ''}`
      : `drawn divided by 1e${tr.exponent}`;
    const base = a.title && typeof a.title === 'object' ? (a.title as Record<string, unknown>) : {};
    a.title = { ...base, text: title ? `${title}, ${how}` : how };
    const range = a.range;
    if (Array.isArray(range) && range.length === 2 && typeof range[0] === 'number' && typeof range[1] === 'number') {
      a.range = [toDrawn(range[0], tr), toDrawn(range[1], tr)];
    }
    outLayout[key] = a;
    const what = title || `The ${axis[0]} axis`;
    const r = ranges.get(axis)!;
    notes.push(tr.offset !== 0
      ? `${what}: the values differ only in their last digits (they span ${short(r.hi - r.lo)} at ${short(tr.offset)}), too little for the plot to label, so they are ${how}. The data and every result are unchanged.`
      : `${what}: values of magnitude up to ${short(Math.max(Math.abs(r.lo), Math.abs(r.hi)))} are ${Math.max(Math.abs(r.lo), Math.abs(r.hi)) > LARGE ? 'too large' : 'too small'} for the plot to draw, so they are ${how}. The data and every result are unchanged.`);
  }
  // Ranges the page asks for must be finite and rising, or the plot chooses its own.
  for (const key of Object.keys(outLayout)) {
    if (!/^[xy]axis\d*$/.test(key)) continue;
    const a = outLayout[key] as Record<string, unknown> | undefined;
    const range = a?.range;
    if (Array.isArray(range) && !(Number.isFinite(range[0]) && Number.isFinite(range[1]) && (range[1] as number) > (range[0] as number))) {
      outLayout[key] = { ...a, range: undefined, autorange: true };
    }
  }
  if (Array.isArray(layout.shapes) && Object.keys(transforms).length) {
    outLayout.shapes = layout.shapes.map((s) => {
      const c: PlotShape = { ...s };
      for (const [ref, keys] of [['xref', ['x0', 'x1']], ['yref', ['y0', 'y1']]] as const) {
        const axis = typeof s[ref] === 'string' ? (s[ref] as string) : ref[0];
        const tr = transforms[axis];
        if (!tr) continue;
        for (const k of keys) if (typeof s[k] === 'number') c[k] = toDrawn(s[k], tr);
      }
      return c;
    });
  }
  return { data: out, layout: outLayout, transforms, notes };
}

/** A value read off an axis drawn with `tr` back in data units. */
export function toDataUnits(value: number, tr: AxisTransform | undefined): number {
  if (!tr) return value;
  if (tr.exponent < -290) return (value * Number(`1e${tr.exponent + 300}`)) / 1e300 + tr.offset;
  return value * Number(`1e${tr.exponent}`) + tr.offset;
}
