/** The cartesian distribution ships no types; its API is the full bundle's (typed by plotly.js-dist-min). */
declare module 'plotly.js-cartesian-dist-min' {
  import Plotly from 'plotly.js-dist-min';
  export default Plotly;
}
