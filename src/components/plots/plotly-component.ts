/**
 * The Plotly React component bound to the min bundle. Imported only through a dynamic import
 * (see Plot.tsx), so the 4.8 MB bundle is fetched by pages that draw a plot, and only when they do.
 * Plotly touches `window` when it loads: never import this from code that runs on the server.
 */
import Plotly from 'plotly.js-dist-min';
import createPlotlyComponent from 'react-plotly.js/factory';

const PlotlyComponent = createPlotlyComponent(Plotly);
export default PlotlyComponent;
