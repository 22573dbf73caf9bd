/**
 * The plotly bundles inlined into pages. Shot records, overlays and comparisons use the basic partial bundle
 * (scatter, bar, pie): a quarter of the full bundle's size, evaluated several times faster. Study pages need
 * heat maps and scatter matrices, which only the cartesian partial bundle has. Read from node_modules when a
 * page is built, so a page needs nothing at view time.
 */
import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';

import { PLOTLY_PACKAGE } from './plotly-names.js';

export { PLOTLY_PACKAGE, STUDY_PLOTLY_PACKAGE } from './plotly-names.js';

const cached = new Map<string, string>();

export function plotlyBundleSource(packageName: string = PLOTLY_PACKAGE): string {
  let source = cached.get(packageName);
  if (source === undefined) {
    source = readFileSync(createRequire(import.meta.url).resolve(packageName), 'utf8');
    // The bundle is inlined in a <script> element: a closing tag inside it would end the element early.
    if (/<\/script/i.test(source)) throw new Error(`${packageName} contains "</script" and cannot be inlined`);
    cached.set(packageName, source);
  }
  return source;
}
