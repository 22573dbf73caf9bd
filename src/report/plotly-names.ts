/**
 * Which plotly bundle each page inlines (plotly-bundle.ts reads them from node_modules). Shot records, overlays
 * and comparisons use the basic partial bundle (scatter, bar, pie); study pages need heat maps and scatter
 * matrices, which only the cartesian partial bundle has. No I/O here: the design page's browser code names the
 * record's bundle too.
 */
export const PLOTLY_PACKAGE = 'plotly.js-basic-dist-min';
export const STUDY_PLOTLY_PACKAGE = 'plotly.js-cartesian-dist-min';
