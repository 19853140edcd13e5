/**
 * The Plotly React component bound to Plotly's cartesian distribution (scatter, heatmap and the
 * other 2-D trace types; 1.5 MB instead of the full 4.8 MB bundle, which adds 3-D, maps and
 * WebGL traces no page draws). Imported only through a dynamic import (see Plot.tsx), so the bundle
 * is fetched by pages that draw a plot, and only when they do. Plotly touches `window` when it
 * loads: never import this from code that runs on the server.
 */
import Plotly from 'plotly.js-cartesian-dist-min';
import createPlotlyComponent from 'react-plotly.js/factory';

const PlotlyComponent = createPlotlyComponent(Plotly);
export default PlotlyComponent;
