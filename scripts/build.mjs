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
});
