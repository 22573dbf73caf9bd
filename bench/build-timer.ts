/** Bundle bench/shot-timer.ts as the CLI and the sweep workers are bundled; returns the bundle's path. */
import { build } from 'esbuild';

export const SHOT_TIMER = 'dist/bench-shot-timer.mjs';

export async function buildShotTimer(): Promise<string> {
  await build({
    entryPoints: ['bench/shot-timer.ts'],
    outfile: SHOT_TIMER,
    bundle: true,
    platform: 'node',
    format: 'esm',
    target: 'node20',
    banner: { js: "import { createRequire as __benchCreateRequire } from 'node:module'; const require = __benchCreateRequire(import.meta.url);" },
    logLevel: 'warning',
  });
  return SHOT_TIMER;
}
