// Bundle the CLI (and the study worker) with esbuild: one file each, so a run does not pay for
// resolving hundreds of mathjs modules at start-up.
import { build } from 'esbuild';

const banner = {
  js: "import { createRequire as __railpulseCreateRequire } from 'node:module'; const require = __railpulseCreateRequire(import.meta.url);",
};
const entries = [
  { in: 'src/cli/main.ts', out: 'railpulse' },
  { in: 'src/study/worker.ts', out: 'sweep-worker' },
];
await build({
  entryPoints: entries,
  outdir: 'dist',
  outExtension: { '.js': '.mjs' },
  bundle: true,
  platform: 'node',
  format: 'esm',
  target: 'node20',
  banner,
  sourcemap: false,
  minify: false,
  legalComments: 'inline',
  logLevel: 'warning',
  external: ['playwright-core'],
  // the unit library is loaded on first use from its own file beside the bundle (src/units/unitLibrary.ts)
  define: { RAILPULSE_BUNDLED_UNIT_LIBRARY: JSON.stringify('./unit-library.cjs') },
});
// mathjs's `unit` alone, as CommonJS so the synchronous scenario loaders can require it when a value needs it
await build({
  entryPoints: ['src/units/unit-library-entry.ts'],
  outfile: 'dist/unit-library.cjs',
  bundle: true,
  platform: 'node',
  format: 'cjs',
  target: 'node20',
  sourcemap: false,
  minify: false,
  legalComments: 'inline',
  logLevel: 'warning',
});
