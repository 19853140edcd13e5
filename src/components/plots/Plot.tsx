import { Component, lazy, Suspense, useMemo, useState, type ReactNode } from 'react';
import type { Config, Data, Layout, ModeBarDefaultButtons, PlotMouseEvent, PlotRelayoutEvent } from 'plotly.js-dist-min';
import { usePlotTheme, type PlotTheme } from './plot-theme';

// The 1.5 MB Plotly bundle (cartesian traces only) arrives in its own chunk the first time a plot renders (or is preloaded).
const loadPlotly = () => import('./plotly-component');
const PlotlyComponent = lazy(loadPlotly);

/**
 * Starts fetching and evaluating the plot bundle now, e.g. while a page still reads its data, so
 * the first plot does not wait for it afterwards. Safe to call more than once.
 */
export function preloadPlotly(): void {
  loadPlotly().catch(() => undefined);
}

export interface PlotProps {
  /** What the plot shows, for screen readers and the PNG file name. */
  label: string;
  data: Data[];
  /** Layout without colours or fonts: the theme fills those in. */
  layout?: Partial<Layout>;
  /** Height in CSS pixels (default 320). */
  height?: number;
  config?: Partial<Config>;
  /** data-testid of the figure, for browser tests. */
  testId?: string;
  /** Click on a data point (run page markers). */
  onClick?: (event: PlotMouseEvent) => void;
  /** Zoom, pan or a dragged shape. */
  onRelayout?: (event: PlotRelayoutEvent) => void;
  /** The graph element once drawn, for Plotly.downloadImage. */
  onReady?: (graphDiv: HTMLElement) => void;
}

/**
 * A Plotly plot themed for light and dark, sized to its container, loading Plotly on first use.
 * Must be rendered only in the browser: use it inside a `client:only="react"` island.
 */
export default function Plot({ label, data, layout, height = 320, config, testId, onClick, onRelayout, onReady }: PlotProps) {
  const theme = usePlotTheme();
  const [ready, setReady] = useState(false);
  const themedLayout = useMemo(() => themeLayout(theme, layout ?? {}, height), [theme, layout, height]);
  const fullConfig = useMemo<Partial<Config>>(
    () => ({
      displaylogo: false,
      responsive: true,
      // Nothing leaves the page: no button sends a chart or its data to an outside service (the
      // bundle still knows the button, its types no longer list it).
      showSendToCloud: false,
      showEditInChartStudio: false,
      modeBarButtonsToRemove: ['lasso2d', 'select2d', 'sendDataToCloud' as ModeBarDefaultButtons],
      toImageButtonOptions: { format: 'png', filename: fileName(label), scale: 2 },
      ...config,
    }),
    [config, label],
  );
  return (
    <figure aria-label={label} data-testid={testId} data-plot-ready={ready || undefined} className="min-w-0" style={{ minHeight: height }}>
      <PlotErrorBoundary height={height}>
        <Suspense fallback={<PlotPlaceholder height={height} text="Loading the plotting library…" />}>
          <PlotlyComponent
            data={data}
            layout={themedLayout}
            config={fullConfig}
            useResizeHandler
            style={{ width: '100%', height }}
            onInitialized={(_figure, graphDiv) => {
              setReady(true);
              onReady?.(graphDiv);
            }}
            onClick={onClick}
            onRelayout={onRelayout}
          />
        </Suspense>
      </PlotErrorBoundary>
    </figure>
  );
}

/** A box of the plot's size with a short text, while Plotly loads or when data are pending. */
export function PlotPlaceholder({ height, text }: { height: number; text: string }) {
  return (
    <div className="grid place-items-center rounded-md border border-dashed border-line text-sm text-muted" style={{ height }}>
      <span role="status">{text}</span>
    </div>
  );
}

class PlotErrorBoundary extends Component<{ height: number; children: ReactNode }, { failed: boolean }> {
  state = { failed: false };
  static getDerivedStateFromError() {
    return { failed: true };
  }
  render() {
    if (this.state.failed) {
      return <PlotPlaceholder height={this.props.height} text="The plotting library could not be loaded. Reload the page to try again." />;
    }
    return this.props.children;
  }
}

const AXIS_KEY = /^[xy]axis\d*$/;

/** Fills colours, fonts and margins of a layout from the page theme; axes given by the caller keep their settings. */
export function themeLayout(theme: PlotTheme, layout: Partial<Layout>, height: number): Partial<Layout> {
  const axis = {
    gridcolor: theme.line,
    zerolinecolor: theme.line,
    linecolor: theme.line,
    tickcolor: theme.line,
    tickfont: { family: '"JetBrains Mono Variable", ui-monospace, monospace', size: 11, color: theme.muted },
    title: { font: { size: 12, color: theme.ink } },
    automargin: true,
  };
  const out: Record<string, unknown> = {
    autosize: true,
    height,
    margin: { l: 56, r: 16, t: 12, b: 44 },
    paper_bgcolor: 'rgba(0,0,0,0)',
    plot_bgcolor: 'rgba(0,0,0,0)',
    font: { family: '"Inter Variable", system-ui, sans-serif', size: 12, color: theme.ink },
    colorway: theme.series,
    hoverlabel: { bgcolor: theme.panel, bordercolor: theme.line, font: { color: theme.ink, family: '"JetBrains Mono Variable", ui-monospace, monospace', size: 11 } },
    legend: { bgcolor: 'rgba(0,0,0,0)', orientation: 'h', x: 0, y: 1.02, yanchor: 'bottom', font: { size: 12, color: theme.ink } },
    modebar: { bgcolor: 'rgba(0,0,0,0)', color: theme.muted, activecolor: theme.accent },
    ...layout,
  };
  for (const key of ['xaxis', 'yaxis', ...Object.keys(layout).filter((k) => AXIS_KEY.test(k))]) {
    const given = (layout as Record<string, Record<string, unknown> | undefined>)[key] ?? {};
    const givenTitle = typeof given.title === 'string' ? { text: given.title } : (given.title as Record<string, unknown> | undefined);
    out[key] = { ...axis, ...given, title: { ...axis.title, ...givenTitle } };
  }
  return out as Partial<Layout>;
}

function fileName(label: string): string {
  return label.toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-|-$/g, '') || 'plot';
}
