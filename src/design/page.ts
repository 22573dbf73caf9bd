/**
 * The design page as a file: one self-contained HTML page for a scenario, with the simulator bundled for the
 * browser (dist/design-app.js, built by scripts/build.mjs) and the scenario embedded. The page draws on canvases;
 * the records' plotly bundle rides along as inert text, copied into the record Save record writes. Same content-security policy as the records: nothing is fetched, the page works from file://.
 */
import { existsSync, readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { fileRecord, recordBaseName } from '../pipeline/record.js';
import { shoot } from '../pipeline/shoot.js';
import { escapeHtml, jsonScriptElement } from '../report/escape.js';
import { plotlyBundleSource } from '../report/plotly-bundle.js';
import { safetyBanner, safetyProcedures } from '../report/safety.js';
import { bankOnPage } from '../report/shot-record.js';
import { pageStart } from '../report/styles.js';
import type { LoadedScenario } from '../scenario/load.js';
import { TOOL_VERSION } from '../version.js';

export const DESIGN_APP_FILE = 'design-app.js';

/** The browser bundle: dist/design-app.js beside the package's dist/ (from src/design/ or from dist/ itself). */
export function designAppSource(): string {
  let folder = dirname(fileURLToPath(import.meta.url));
  for (let up = 0; up < 4; up++) {
    const candidate = join(folder, 'dist', DESIGN_APP_FILE);
    if (existsSync(candidate)) return readFileSync(candidate, 'utf8');
    const beside = join(folder, DESIGN_APP_FILE);
    if (existsSync(beside)) return readFileSync(beside, 'utf8');
    folder = dirname(folder);
  }
  throw new Error(`dist/${DESIGN_APP_FILE} is missing: run "npm run build" (npm ci does it)`);
}

const DESIGN_CSS = `
main.design{max-width:none;padding:0 18px 40px}
#design-safety{position:sticky;top:0;z-index:10;background:#fff;padding-bottom:6px}
.design-bar{display:flex;gap:10px;align-items:center;flex-wrap:wrap;margin:10px 0}
.design-bar button,.group-buttons button,#design-add-group{font:inherit;padding:4px 12px;border:1px solid #555;background:#f4f4f4;border-radius:3px;cursor:pointer}
.design-bar button:disabled,.group-buttons button:disabled{opacity:.45;cursor:default}
.state{font-size:13px;color:#333}.state.error{color:#a00;font-weight:600}
.design-columns{display:grid;grid-template-columns:minmax(300px,380px) 1fr;gap:22px;align-items:start}
#design-controls{position:sticky;top:120px;max-height:calc(100vh - 130px);overflow-y:auto;padding-right:6px}
.control-group{border:1px solid #ccc;margin:0 0 10px;padding:6px 10px}
.control-group legend{font-weight:600;font-size:13px}
.control{margin:5px 0}
.control label{display:flex;gap:8px;align-items:center;font-size:12.5px}
.control .name{flex:0 0 45%;overflow:hidden;text-overflow:ellipsis;white-space:nowrap}
.control .entry{flex:1;min-width:0;font:12.5px ui-monospace,monospace;padding:2px 4px}
.control .slider{width:100%;margin:2px 0 0}
.control.bad .entry{border:2px solid #b00;background:#fff0f0}
.control .message{color:#a00;font-size:12px}
.group-buttons{display:flex;gap:6px;margin:2px 0 4px}
.plot-canvas{display:block;width:100%;height:340px}
@media (max-width:900px){.design-columns{grid-template-columns:1fr}#design-controls{position:static;max-height:none}}
`;

/**
 * The page's HTML for a loaded scenario (the first shot is drawn by the page itself when it opens). The simulator
 * comes before the inert plotly text, so the first shot is drawn while the parser still reads that megabyte; the
 * text is needed only when a record is saved.
 */
export function designPageHtml(loaded: LoadedScenario, appSource = designAppSource(), plotlySource = plotlyBundleSource()): string {
  const bank = bankOnPage(loaded.scenario);
  const title = `${loaded.scenario.name} \u2014 railpulse design page`;
  return `${pageStart(title, { generator: `railpulse ${TOOL_VERSION}`, css: DESIGN_CSS })}
${jsonScriptElement('railpulse-design', { file: loaded.file, source: loaded.source })}
</head>
<body data-state="loading" data-shots="0">
<main class="design">
<header>
<p class="kicker">railpulse \u00B7 design page (simulation in this page, nothing leaves it)</p>
<h1>${escapeHtml(loaded.scenario.name)}</h1>
<p class="description">Change a value (type it with its unit, as in a scenario file, or move its slider): the shot is simulated again at once with the same code as <code>railpulse run</code>. Save the scenario and run it, or save the record <code>run</code> would file for it.</p>
</header>
<div id="design-safety">${safetyBanner([bank])}</div>
<div class="design-bar">
<button type="button" id="design-undo" disabled>Undo</button>
<button type="button" id="design-save-scenario">Save scenario (JSON)</button>
<button type="button" id="design-save-record">Save record (HTML)</button>
<span id="design-state" class="state" role="status">Simulating the first shot\u2026</span>
</div>
<noscript><p class="note">This page simulates with JavaScript; enable it to use the page.</p></noscript>
<div class="design-columns">
<section id="design-controls" aria-label="Scenario quantities"></section>
<div>
<div id="design-status"></div>
<section id="design-figures-section" aria-label="Key figures"><h2>Key figures</h2><div id="design-figures"></div></section>
<div id="design-checks"></div>
<section id="plots"><h2>Waveforms and energy</h2><div id="design-plots"></div></section>
<pre id="design-results" hidden></pre>
</div>
</div>
${safetyProcedures([bank])}
<footer>Design page produced by railpulse ${escapeHtml(TOOL_VERSION)}. Model results, not measurements. Plots drawn on canvases by the page itself; plotly.js (MIT licence) is carried inline for the saved record.</footer>
</main>
<script>${appSource}</script>
<script type="text/plain" id="railpulse-plotly">${plotlySource}</script>
</body>
</html>
`;
}

/** Write the design page of a loaded scenario where `target` says (a folder or a new .html file); returns the path. */
export function writeDesignPage(loaded: LoadedScenario, target?: string): string {
  const html = designPageHtml(loaded);
  const assessedName = recordBaseName(shoot(loaded, { waveforms: false }), '_design');
  return fileRecord(html, { target, baseName: assessedName, option: '--output' });
}
