/**
 * src/ui/plot-config.ts: the plot library's configuration, the same for
 * every figure. Its promises (from its header): nothing in it can send the
 * figure's data off the machine (no share-to-cloud button, an empty server
 * address, no vendor logo link, every address this page's own), the toolbar
 * is listed button by button and holds only buttons that act inside the
 * page, and the saved picture is named by the caller. The browser-side
 * check of the merged configuration of every drawn figure is
 * e2e/no-network.spec.ts.
 */
import { describe, expect, it } from 'vitest';
import { LOCAL_TOOLBAR, plotConfig } from '../../src/ui/plot-config.ts';

/** Every string anywhere inside a value. */
const strings = (v: unknown): string[] => (typeof v === 'string' ? [v] : Array.isArray(v) ? v.flatMap(strings) : v && typeof v === 'object' ? Object.values(v).flatMap(strings) : []);

describe('plotConfig', () => {
  const c = plotConfig('demo-sample-plot');

  it('offers no way to send data away: cloud sharing off, server address empty, no vendor logo link', () => {
    // Plotly config keys (plotly.js src/plot_api/plot_config.js, from memory): showSendToCloud adds the
    // "send data to cloud" button, plotlyServerURL is where it posts, displaylogo links to the vendor's site.
    expect(c.showSendToCloud).toBe(false);
    expect(c.plotlyServerURL).toBe('');
    expect(c.displaylogo).toBe(false);
    expect((c as Record<string, unknown>).showEditInChartStudio ?? false).toBe(false);
    expect((c as Record<string, unknown>).linkText ?? '').toBe('');
  });

  it('every address in the configuration is this page’s own: no scheme, no host', () => {
    const all = strings(c);
    expect(all.length).toBeGreaterThan(0);
    for (const s of all) expect(s, s).not.toMatch(/^[a-z][a-z0-9+.-]*:|\/\//i);
    expect(c.topojsonURL).toBe('./');
  });

  it('the toolbar is exactly the listed local buttons, in one group; no cloud, link or editor button', () => {
    expect(c.displayModeBar).toBe(true);
    expect(c.modeBarButtons).toEqual([[...LOCAL_TOOLBAR]]);
    // Plotly's own names of its buttons that reach another host (plotly.js src/components/modebar/buttons.js, from memory).
    for (const away of ['sendDataToCloud', 'editInChartStudio']) expect(LOCAL_TOOLBAR as readonly string[]).not.toContain(away);
    expect(new Set(LOCAL_TOOLBAR).size).toBe(LOCAL_TOOLBAR.length);
    expect(LOCAL_TOOLBAR).toContain('toImage'); // saving a picture: made in the browser and downloaded
    expect(LOCAL_TOOLBAR).toContain('resetScale2d');
  });

  it('the saved picture is a PNG named by the caller; each call gives its own object (one figure cannot change another’s)', () => {
    expect(c.toImageButtonOptions).toMatchObject({ format: 'png', filename: 'demo-sample-plot' });
    const d = plotConfig('other');
    expect(d.toImageButtonOptions?.filename).toBe('other');
    expect(d).not.toBe(c);
    (d.modeBarButtons as string[][])[0].push('sendDataToCloud');
    expect(plotConfig('x').modeBarButtons).toEqual([[...LOCAL_TOOLBAR]]);
    expect(c.modeBarButtons).toEqual([[...LOCAL_TOOLBAR]]);
  });
});
