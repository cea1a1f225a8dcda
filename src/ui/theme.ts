/**
 * Issue 17: a dark theme that follows the system setting
 * (prefers-color-scheme). The page's colours are CSS variables switched by a
 * media query in styles.css; the figures take theirs from here, applied to
 * every figure in one place (PlotlyFigure).
 */
import { useSyncExternalStore } from 'react';
import type { PlotData, PlotLayout } from 'plotly.js-strict-dist-min';
import { COLOURS } from './palette.ts';

const QUERY = '(prefers-color-scheme: dark)';

function subscribe(onChange: () => void): () => void {
  if (typeof window === 'undefined' || !window.matchMedia) return () => {};
  const m = window.matchMedia(QUERY);
  m.addEventListener('change', onChange);
  return () => m.removeEventListener('change', onChange);
}

const snapshot = () => (typeof window !== 'undefined' && !!window.matchMedia && window.matchMedia(QUERY).matches);

/** True while the system asks for dark colours. */
export function useDarkScheme(): boolean {
  return useSyncExternalStore(subscribe, snapshot, () => false);
}

/** Figure colours for dark pages: background, text, grid and zero lines. */
export const DARK = { paper: '#161b22', ink: '#e3e8ee', grid: '#2f3742', zero: '#5b6673', legend: 'rgba(22,27,34,0.85)' } as const;

type Obj = Record<string, unknown>;

/** The layout with dark colours (a copy; light layouts are returned unchanged). */
export function themedLayout(layout: PlotLayout, dark: boolean): PlotLayout {
  if (!dark) return layout;
  const out: Obj = { ...(layout as Obj), paper_bgcolor: DARK.paper, plot_bgcolor: DARK.paper };
  out.font = { ...((layout as Obj).font as Obj | undefined), color: DARK.ink };
  for (const k of Object.keys(out)) {
    if (/^[xy]axis\d*$/.test(k) && out[k] && typeof out[k] === 'object') {
      out[k] = { ...(out[k] as Obj), gridcolor: DARK.grid, zerolinecolor: DARK.zero, linecolor: DARK.zero, tickcolor: DARK.zero };
    }
  }
  if (out.legend && typeof out.legend === 'object') out.legend = { ...(out.legend as Obj), bgcolor: DARK.legend };
  return out as PlotLayout;
}

/** Swap the light ink colour for the dark one wherever a trace uses it (lines, markers, labels). */
export function themedData(data: PlotData[], dark: boolean): PlotData[] {
  if (!dark) return data;
  const swap = (v: unknown): unknown => {
    if (v === COLOURS.ink) return DARK.ink;
    if (Array.isArray(v)) return v.some((e) => e === COLOURS.ink) ? v.map((e) => (e === COLOURS.ink ? DARK.ink : e)) : v;
    if (v && typeof v === 'object' && !ArrayBuffer.isView(v)) {
      const o = v as Obj;
      let copy: Obj | null = null;
      for (const k of ['color', 'line', 'marker', 'textfont', 'font']) {
        if (!(k in o)) continue;
        const s = swap(o[k]);
        if (s !== o[k]) { copy ??= { ...o }; copy[k] = s; }
      }
      return copy ?? o;
    }
    return v;
  };
  return data.map((t) => swap(t) as PlotData);
}
