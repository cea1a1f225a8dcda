// Minimal typing for the strict Plotly bundle: only what the page calls.
declare module 'plotly.js-strict-dist-min' {
  export type PlotData = Record<string, unknown>;
  export type PlotLayout = Record<string, unknown>;
  export type PlotConfig = Record<string, unknown>;
  export interface PlotlyHTMLElement extends HTMLDivElement {
    on(event: string, handler: (ev: unknown) => void): void;
    removeAllListeners?(event: string): void;
    _fullLayout?: Record<string, unknown>;
  }
  const Plotly: {
    react(el: HTMLElement, data: PlotData[], layout?: PlotLayout, config?: PlotConfig): Promise<PlotlyHTMLElement>;
    purge(el: HTMLElement): void;
    relayout(el: HTMLElement, update: Record<string, unknown>): Promise<PlotlyHTMLElement>;
    toImage(el: HTMLElement, opts: { format: 'png' | 'svg'; width?: number; height?: number; scale?: number }): Promise<string>;
    downloadImage(el: HTMLElement, opts: { format: 'png' | 'svg'; filename?: string; width?: number; height?: number }): Promise<string>;
    Plots: { resize(el: HTMLElement): void };
  };
  export default Plotly;
}
