import { describe, expect, it } from 'vitest';
import { ALTERNATIVE_COLOURS, COLOURS } from '../../src/ui/palette.ts';
import { DARK } from '../../src/ui/theme.ts';

// WCAG 2.1 relative luminance and contrast ratio (W3C, "Web Content
// Accessibility Guidelines 2.1", definitions of relative luminance and
// contrast ratio): sRGB channel c/255 linearised as c/12.92 below 0.04045,
// else ((c+0.055)/1.055)^2.4; L = 0.2126 R + 0.7152 G + 0.0722 B;
// ratio = (L1 + 0.05) / (L2 + 0.05).
function luminance(hex: string): number {
  const c = [1, 3, 5].map((i) => parseInt(hex.slice(i, i + 2), 16) / 255).map((v) => (v <= 0.04045 ? v / 12.92 : ((v + 0.055) / 1.055) ** 2.4));
  return 0.2126 * c[0] + 0.7152 * c[1] + 0.0722 * c[2];
}
function contrast(a: string, b: string): number {
  const [l1, l2] = [luminance(a), luminance(b)].sort((x, y) => y - x);
  return (l1 + 0.05) / (l2 + 0.05);
}

// Okabe & Ito (2002), "Color Universal Design": the eight colours (from memory of the published RGB values).
const OKABE_ITO = ['#000000', '#E69F00', '#56B4E9', '#009E73', '#F0E442', '#0072B2', '#D55E00', '#CC79A7'];

describe('the contrast formula itself', () => {
  it('gives the WCAG end points: black on white 21:1, a colour on itself 1:1', () => {
    expect(contrast('#000000', '#ffffff')).toBeCloseTo(21, 6);
    expect(contrast('#0072B2', '#0072B2')).toBe(1);
  });
});

describe('COLOURS', () => {
  it('text ink reads on the white page at the WCAG 2.1 AA 4.5:1 for normal text (SC 1.4.3), and the dark ink on the dark figure background', () => {
    expect(contrast(COLOURS.ink, '#ffffff')).toBeGreaterThanOrEqual(4.5);
    expect(contrast(DARK.ink, DARK.paper)).toBeGreaterThanOrEqual(4.5);
  });
  it('the main lines (processed, residual, peak marks) stand out from white at 3:1, WCAG 2.1 SC 1.4.11 for graphical objects', () => {
    for (const c of [COLOURS.processed, COLOURS.residual, COLOURS.peak, COLOURS.lost]) expect(contrast(c, '#ffffff')).toBeGreaterThanOrEqual(3);
  });
  it('the grid stays faint: under 1.5:1 against white, so it never competes with a trace', () => {
    expect(contrast(COLOURS.grid, '#ffffff')).toBeLessThan(1.5);
  });
  it('every coloured series is an Okabe–Ito colour; raw is a neutral grey (equal channels)', () => {
    for (const k of ['processed', 'residual', 'baseline', 'spike', 'peak', 'intermediate', 'lost'] as const) {
      expect(OKABE_ITO).toContain(COLOURS[k].toUpperCase());
    }
    const raw = COLOURS.raw.slice(1);
    expect(raw.slice(0, 2)).toBe(raw.slice(2, 4));
    expect(raw.slice(2, 4)).toBe(raw.slice(4, 6));
  });
  it('no two series share a colour', () => {
    const series = [COLOURS.raw, COLOURS.processed, COLOURS.residual, COLOURS.baseline, COLOURS.spike, COLOURS.peak, COLOURS.intermediate];
    expect(new Set(series.map((c) => c.toUpperCase())).size).toBe(series.length);
  });
});

describe('ALTERNATIVE_COLOURS', () => {
  it('six different Okabe–Ito colours, none of them the raw grey', () => {
    expect(ALTERNATIVE_COLOURS).toHaveLength(6);
    expect(new Set(ALTERNATIVE_COLOURS).size).toBe(6);
    for (const c of ALTERNATIVE_COLOURS) expect(OKABE_ITO).toContain(c.toUpperCase());
    expect(ALTERNATIVE_COLOURS).not.toContain(COLOURS.raw);
  });
});
