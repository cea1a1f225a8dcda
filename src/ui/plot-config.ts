/**
 * The plot library's configuration, the same for every figure on the page.
 *
 * The library's defaults reach for other hosts: a "share chart" button that
 * opens a window on a remote server and posts the figure's data to it
 * (config `showSendToCloud`, address `plotlyServerURL`, which the library
 * also takes from a global `PLOTLYENV.BASE_URL`), a logo that links to the
 * vendor's site (`displaylogo`), and a map-outline address (`topojsonURL`,
 * used only by map traces, which the page never draws). A meta-tag
 * Content-Security-Policy cannot stop a script from opening a window or
 * posting a message to it, so the guard is here: the toolbar is listed
 * button by button (only buttons that act inside the page: zoom, pan,
 * select, zoom in and out, autoscale, reset, and saving a picture, which is
 * made in the browser and downloaded), the server address is empty (the
 * library refuses to share without one), and every address is this page's
 * own. `e2e/no-network.spec.ts` reads each figure's merged configuration
 * and fails on any address of another origin.
 */
import type { PlotConfig } from 'plotly.js-strict-dist-min';

/** Toolbar buttons that work inside the page. Nothing here can send data anywhere. */
export const LOCAL_TOOLBAR = ['toImage', 'zoom2d', 'pan2d', 'select2d', 'zoomIn2d', 'zoomOut2d', 'autoScale2d', 'resetScale2d'] as const;

/** The configuration of one figure; `pictureName` names the downloaded picture. */
export function plotConfig(pictureName: string): PlotConfig {
  return {
    displaylogo: false,
    showSendToCloud: false,
    plotlyServerURL: '',
    // Never fetched (no map traces), but an address of this page's own rather than the library's host.
    topojsonURL: './',
    displayModeBar: true,
    modeBarButtons: [[...LOCAL_TOOLBAR]],
    toImageButtonOptions: { format: 'png', filename: pictureName, scale: 2 },
    showTips: false,
    responsive: true,
    scrollZoom: true,
  };
}
