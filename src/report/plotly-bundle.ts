/**
 * The plotly bundle inlined into shot reports. The basic partial bundle (scatter, bar, pie) covers every
 * trace a shot report draws; it is a quarter of the full bundle's size and evaluates several times faster.
 * Read from node_modules when a report is built, so a report needs nothing at view time.
 */
import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';

export const PLOTLY_PACKAGE = 'plotly.js-basic-dist-min';

let cached: string | undefined;

export function plotlyBundleSource(): string {
  if (cached === undefined) {
    const requireFromHere = createRequire(import.meta.url);
    const source = readFileSync(requireFromHere.resolve(PLOTLY_PACKAGE), 'utf8');
    // The bundle is inlined in a <script> element: a closing tag inside it would end the element early.
    if (/<\/script/i.test(source)) throw new Error(`${PLOTLY_PACKAGE} contains "</script" and cannot be inlined`);
    cached = source;
  }
  return cached;
}
