// Typing for the strict Plotly bundle: what the page draws and calls, no more (issue 19: the plot boundary is typed).
declare module 'plotly.js-strict-dist-min' {
  /** Numbers for one axis: typed arrays go to the plot as they are (no copy per recompute). */
  export type PlotValues = ArrayLike<number | null> | readonly (number | null)[];
  export type Dash = 'solid' | 'dot' | 'dash' | 'longdash' | 'dashdot' | 'longdashdot';
  export interface PlotLine { color?: string; width?: number; dash?: Dash | string; shape?: 'linear' | 'hv' | 'vh' | 'spline' }
  export interface PlotMarker { symbol?: string; size?: number | number[]; color?: string | string[]; line?: PlotLine; opacity?: number }
  export interface PlotFont { family?: string; size?: number; color?: string }

  /** One trace (the page draws scatter and bar traces only). */
  export interface PlotData {
    type: 'scatter' | 'bar';
    mode?: 'lines' | 'markers' | 'text' | 'lines+markers' | 'markers+text' | 'lines+text';
    name?: string;
    x?: PlotValues;
    y?: PlotValues;
    text?: string | readonly string[];
    hovertext?: string | readonly string[];
    hoverinfo?: string;
    hovertemplate?: string;
    textposition?: string | readonly string[];
    textfont?: PlotFont;
    cliponaxis?: boolean;
    line?: PlotLine;
    marker?: PlotMarker;
    xaxis?: string;
    yaxis?: string;
    showlegend?: boolean;
    legendgroup?: string;
    visible?: boolean | 'legendonly';
    fill?: 'none' | 'tozeroy' | 'tonexty' | 'toself';
    fillcolor?: string;
    opacity?: number;
    width?: number | readonly number[];
    error_y?: { type: 'data'; array: PlotValues; visible?: boolean; color?: string; thickness?: number; width?: number };
  }

  export interface PlotAxis {
    title?: { text: string; font?: PlotFont } | string;
    type?: 'linear' | 'log' | 'category';
    range?: [number, number] | number[];
    autorange?: boolean | 'reversed';
    domain?: [number, number];
    anchor?: string;
    gridcolor?: string;
    zeroline?: boolean;
    zerolinecolor?: string;
    showgrid?: boolean;
    tickformat?: string;
    exponentformat?: string;
    fixedrange?: boolean;
    automargin?: boolean;
    linecolor?: string;
    tickfont?: PlotFont;
    color?: string;
    [more: string]: unknown;
  }

  /** A shape (bands, bounds): the fields the page sets. */
  export interface PlotShape {
    type: 'rect' | 'line';
    xref?: string; yref?: string;
    x0: number; x1: number; y0: number; y1: number;
    fillcolor?: string;
    line?: PlotLine;
    layer?: 'above' | 'below';
    name?: string;
    showlegend?: boolean;
    legendgroup?: string;
    [more: string]: unknown;
  }

  export interface PlotLayout {
    title?: { text: string; font?: PlotFont; x?: number; y?: number } | string;
    autosize?: boolean;
    width?: number;
    height?: number;
    margin?: { l?: number; r?: number; t?: number; b?: number; pad?: number };
    showlegend?: boolean;
    legend?: { orientation?: 'h' | 'v'; x?: number; y?: number; xanchor?: string; yanchor?: string; font?: PlotFont; bgcolor?: string };
    dragmode?: 'zoom' | 'pan' | 'select' | false;
    selectdirection?: 'h' | 'v' | 'd' | 'any';
    hovermode?: 'closest' | 'x' | 'x unified' | false;
    xaxis?: PlotAxis;
    yaxis?: PlotAxis;
    xaxis2?: PlotAxis;
    yaxis2?: PlotAxis;
    shapes?: PlotShape[];
    annotations?: Record<string, unknown>[];
    uirevision?: string | number;
    datarevision?: string | number;
    paper_bgcolor?: string;
    plot_bgcolor?: string;
    font?: PlotFont;
    bargap?: number;
    barmode?: 'group' | 'overlay' | 'stack';
    [more: string]: unknown;
  }

  export interface PlotConfig {
    displaylogo?: boolean;
    showSendToCloud?: boolean;
    plotlyServerURL?: string;
    topojsonURL?: string;
    displayModeBar?: boolean;
    modeBarButtons?: string[][];
    toImageButtonOptions?: { format: 'png' | 'svg'; filename: string; scale?: number };
    showTips?: boolean;
    responsive?: boolean;
    scrollZoom?: boolean;
    edits?: { shapePosition?: boolean };
    [more: string]: unknown;
  }

  export interface PlotlyHTMLElement extends HTMLDivElement {
    on(event: 'plotly_relayout' | 'plotly_click' | 'plotly_selected' | string, handler: (ev: unknown) => void): void;
    removeAllListeners?(event: string): void;
    removeListener?(event: string, handler: (ev: unknown) => void): void;
    _fullLayout?: Record<string, unknown>;
  }
  const Plotly: {
    react(el: HTMLElement, data: PlotData[], layout?: PlotLayout, config?: PlotConfig): Promise<PlotlyHTMLElement>;
    purge(el: HTMLElement): void;
    relayout(el: HTMLElement, update: Record<string, unknown>): Promise<PlotlyHTMLElement>;
    toImage(el: HTMLElement, opts: { format: 'png' | 'svg'; width?: number; height?: number; scale?: number }): Promise<string>;
    downloadImage(el: HTMLElement, opts: { format: 'png' | 'svg'; filename?: string; width?: number; height?: number }): Promise<string>;
    Plots: { resize(el: HTMLElement): void };
    /** Issue 16: replaces traces' data in place; with no transition and no redraw, only those traces are drawn again (plot-update.ts). */
    animate(
      el: HTMLElement,
      frame: { data: Partial<PlotData>[]; traces: number[] },
      options: { mode?: 'immediate' | 'next' | 'afterall'; transition?: { duration: number }; frame?: { duration: number; redraw: boolean } },
    ): Promise<PlotlyHTMLElement>;
  };
  export default Plotly;
}
