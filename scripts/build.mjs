// Bundle the CLI (and the study worker) with esbuild: one file each, so a run does not pay for
// resolving hundreds of mathjs modules at start-up. Then the design page's simulator for the browser
// (dist/design-app.js), which `railpulse design` inlines into its page.
import { build } from 'esbuild';
import { builtinModules } from 'node:module';
import { createHash } from 'node:crypto';
import { readFileSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';

const banner = {
  js: "import { createRequire as __railpulseCreateRequire } from 'node:module'; const require = __railpulseCreateRequire(import.meta.url);",
};
/** What every bundle for Node shares. */
const forNode = { bundle: true, platform: 'node', target: 'node20', sourcemap: false, minify: false, legalComments: 'inline', logLevel: 'warning' };
// The CLI as CommonJS, run by dist/railpulse.mjs through V8's code cache (scripts/cli-loader.mjs); import.meta.url
// (worker and package paths) becomes the bundle's own file URL.
await build({
  ...forNode,
  entryPoints: { 'railpulse-cli': 'src/cli/main.ts' },
  outdir: 'dist',
  outExtension: { '.js': '.cjs' },
  format: 'cjs',
  banner: { js: 'var __railpulseModuleUrl = require("node:url").pathToFileURL(__filename).href;' },
  external: ['playwright-core'],
  // the unit library is loaded on first use from its own file beside the bundle (src/units/unitLibrary.ts)
  define: { RAILPULSE_BUNDLED_UNIT_LIBRARY: JSON.stringify('./unit-library.cjs'), 'import.meta.url': '__railpulseModuleUrl' },
});
const digest = createHash('sha256').update(readFileSync('dist/railpulse-cli.cjs')).digest('hex').slice(0, 16);
const cacheName = `railpulse-cli.${digest}.v8-cache`;
for (const name of readdirSync('dist')) if (name.endsWith('.v8-cache') && name !== cacheName) rmSync(join('dist', name), { force: true });
writeFileSync('dist/railpulse.mjs', readFileSync('scripts/cli-loader.mjs', 'utf8').replace('__RAILPULSE_CACHE_NAME__', cacheName));

// The study worker, as an ES module.
await build({
  ...forNode,
  entryPoints: { 'sweep-worker': 'src/study/worker.ts' },
  outdir: 'dist',
  outExtension: { '.js': '.mjs' },
  format: 'esm',
  banner,
  define: { RAILPULSE_BUNDLED_UNIT_LIBRARY: JSON.stringify('./unit-library.cjs') },
});
// mathjs's `unit` alone, as CommonJS so the synchronous scenario loaders can require it when a value needs it
await build({
  ...forNode,
  entryPoints: ['src/units/unit-library-entry.ts'],
  outfile: 'dist/unit-library.cjs',
  format: 'cjs',
});

/**
 * The design page's browser bundle holds no Node built-in. Our modules the page imports may import one for a part
 * the page never uses (src/scenario/source.ts reads files for loadScenarioFile; the page calls loadScenarioText):
 * such an import resolves to a side-effect-free placeholder that tree shaking drops with the unused part, and the
 * build fails if a placeholder is still in the bundle (then the page reaches code that needs Node: split the
 * browser-safe part out). node:module is the one exception: src/solve/odex.ts loads odex with createRequire (odex
 * ships no declarations), answered in the browser by scripts/browser/node-module.mjs with the bundled odex.
 * Packages in node_modules resolve as esbuild does for browsers (their "browser" fields).
 */
const builtin = new RegExp(`^(node:)?(${builtinModules.map((name) => name.replace(/[/]/g, '\\/')).join('|')})$`);

const browserBuiltins = {
  name: 'design-page-builtins',
  setup(context) {
    context.onResolve({ filter: builtin }, (args) => {
      if (args.importer.includes('/node_modules/')) return undefined;
      const name = args.path.replace(/^node:/, '');
      if (name === 'module') return { path: new URL('./browser/node-module.mjs', import.meta.url).pathname };
      const importer = args.importer.replace(/^.*?\/(src|scripts)\//, '$1/');
      return { path: `${name} (imported by ${importer})`, namespace: 'node-builtin', sideEffects: false };
    });
    context.onLoad({ filter: /.*/, namespace: 'node-builtin' }, () => ({ contents: 'module.exports = {};', loader: 'js' }));
  },
};

const browser = await build({
  entryPoints: { 'design-app': 'src/design/app.ts' },
  outdir: 'dist',
  bundle: true,
  platform: 'browser',
  format: 'iife',
  target: 'chrome110',
  minify: true,
  legalComments: 'inline',
  logLevel: 'warning',
  metafile: true,
  // odex.ts passes import.meta.url to createRequire, which the stand-in ignores
  define: { 'import.meta.url': '"about:railpulse-design-page"' },
  plugins: [browserBuiltins],
});
const reached = Object.entries(browser.metafile.outputs['dist/design-app.js'].inputs)
  .filter(([input, use]) => input.startsWith('node-builtin:') && use.bytesInOutput > 0)
  .map(([input]) => input);
if (reached.length > 0) {
  throw new Error(`the design page's bundle needs Node built-ins: ${reached.map((input) => input.slice('node-builtin:'.length)).join('; ')}`);
}
