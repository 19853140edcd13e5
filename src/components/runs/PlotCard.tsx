import { forwardRef, useState, type ReactNode } from 'react';
import type { Config, PlotlyHTMLElement } from 'plotly.js-dist-min';
import { readPlotTheme } from '../plots/plot-theme';
import { buttonSmall } from '../ui';

export interface PlotCardProps {
  title: string;
  /** One line under the title: method, resolution, points. */
  note?: ReactNode;
  /** The drawn graph, once there is one, for the PNG export. */
  graph?: HTMLElement | null;
  /** File name of the PNG without extension. */
  fileName: string;
  children: ReactNode;
  testId?: string;
}

/**
 * A titled panel around one plot, with a PNG export of the plot as drawn (zoom included). The
 * ref goes on the plot's box, whose width decides how many points are fetched.
 */
/**
 * Plotly config of the run screens' plots: the card's PNG button replaces Plotly's own (which
 * saves a transparent image), so the mode bar leaves it out.
 */
export const plotConfig: Partial<Config> = { modeBarButtonsToRemove: ['lasso2d', 'select2d', 'toImage'] };

export const PlotCard = forwardRef<HTMLDivElement, PlotCardProps>(function PlotCard({ title, note, graph, fileName, children, testId }, ref) {
  const [saving, setSaving] = useState(false);
  const [failed, setFailed] = useState<string | null>(null);
  async function savePng() {
    if (!graph) return;
    setSaving(true);
    setFailed(null);
    try {
      await downloadPng(graph, fileName);
    } catch (error) {
      setFailed((error as Error).message || 'the image could not be made');
    } finally {
      setSaving(false);
    }
  }
  return (
    <section className="min-w-0 rounded-lg border border-line bg-panel p-4" data-testid={testId}>
      <div className="mb-2 flex flex-wrap items-start justify-between gap-x-4 gap-y-1">
        <div className="min-w-0">
          <h3 className="font-semibold">{title}</h3>
          {note && <p className="font-mono text-xs text-muted">{note}</p>}
        </div>
        <button
          type="button"
          className={buttonSmall}
          disabled={!graph || saving}
          onClick={() => void savePng()}
          title="Save the plot as drawn, zoom included, as a PNG image"
        >
          {saving ? 'Saving…' : 'PNG'}
        </button>
      </div>
      {failed && (
        <p role="alert" className="mb-2 text-xs text-danger">
          PNG export failed: {failed}
        </p>
      )}
      <div ref={ref} className="min-w-0">
        {children}
      </div>
    </section>
  );
});

/**
 * Renders the graph's current figure to a PNG at twice its size on an opaque panel background
 * (the page's plots are transparent, which would leave dark-theme text on nothing), then downloads it.
 */
export async function downloadPng(graph: HTMLElement, fileName: string): Promise<void> {
  const Plotly = (await import('plotly.js-cartesian-dist-min')).default;
  const figure = graph as PlotlyHTMLElement;
  const background = readPlotTheme().panel || 'rgb(255, 255, 255)';
  const url = await Plotly.toImage(
    { data: figure.data, layout: { ...figure.layout, paper_bgcolor: background, plot_bgcolor: background } },
    { format: 'png', width: graph.clientWidth, height: graph.clientHeight, scale: 2 },
  );
  const link = document.createElement('a');
  link.href = url;
  link.download = `${fileName}.png`;
  document.body.append(link);
  link.click();
  link.remove();
}
