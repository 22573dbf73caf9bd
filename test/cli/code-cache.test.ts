/**
 * The CLI's entry (dist/railpulse.mjs, from scripts/cli-loader.mjs) runs the bundle through V8's code cache. The
 * cache must never change what a command prints or its exit code, must be made on the first run and then used as
 * it is, must be replaced when V8 refuses it, and must be skipped when it cannot be written. Each case runs a copy
 * of dist/ in its own folder inside the project (the bundle resolves odex from node_modules).
 */
import { spawnSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { copyFileSync, existsSync, mkdirSync, readFileSync, readdirSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';

const root = join('test-output', `code-cache-${process.pid}`);
const FILES = ['railpulse.mjs', 'railpulse-cli.cjs', 'unit-library.cjs', 'sweep-worker.mjs'];

function copyOfDist(name: string): string {
  const folder = join(root, name);
  mkdirSync(folder, { recursive: true });
  for (const file of FILES) copyFileSync(join('dist', file), join(folder, file));
  return folder;
}

function cacheName(folder: string): string {
  const loader = readFileSync(join(folder, 'railpulse.mjs'), 'utf8');
  return /const CACHE_NAME = '([^']+)'/.exec(loader)![1]!;
}

const run = (folder: string, ...args: string[]) => spawnSync(process.execPath, [join(folder, 'railpulse.mjs'), ...args], { encoding: 'utf8' });
const shot = ['run', 'scenarios/bench-shot.json', '--json', '--no-report'];

afterAll(() => rmSync(root, { recursive: true, force: true }));

describe('the CLI entry and its code cache', () => {
  it('names the cache after a digest of the bundle it belongs to', () => {
    const folder = copyOfDist('name');
    const digest = createHash('sha256').update(readFileSync(join(folder, 'railpulse-cli.cjs'))).digest('hex').slice(0, 16);
    expect(cacheName(folder)).toBe(`railpulse-cli.${digest}.v8-cache`);
  });

  it('makes the cache on the first run, then uses it unchanged, with the same output', () => {
    const folder = copyOfDist('first');
    const cache = join(folder, cacheName(folder));
    expect(existsSync(cache)).toBe(false);
    const first = run(folder, ...shot);
    expect(first.status).toBe(0);
    expect(statSync(cache).size).toBeGreaterThan(1000);
    const made = statSync(cache).mtimeMs;
    const second = run(folder, ...shot);
    expect(second.status).toBe(0);
    expect(second.stdout).toBe(first.stdout);
    expect(statSync(cache).mtimeMs).toBe(made);
    // no temporary file left behind
    expect(readdirSync(folder).filter((f) => f.endsWith('.tmp'))).toEqual([]);
  });

  it('replaces a cache V8 refuses, and the run is unaffected', () => {
    const folder = copyOfDist('refused');
    const cache = join(folder, cacheName(folder));
    const clean = run(folder, ...shot);
    writeFileSync(cache, Buffer.alloc(4096, 7));
    const again = run(folder, ...shot);
    expect(again.status).toBe(0);
    expect(again.stdout).toBe(clean.stdout);
    expect(readFileSync(cache).equals(Buffer.alloc(4096, 7))).toBe(false);
  });

  it('runs as usual when the cache cannot be written, and keeps exit codes and one-line errors', () => {
    const folder = copyOfDist('unwritable');
    // a folder where the cache file would go: reading and writing it both fail
    mkdirSync(join(folder, cacheName(folder), 'blocked'), { recursive: true });
    const ok = run(folder, ...shot);
    expect(ok.status).toBe(0);
    expect(JSON.parse(ok.stdout).outcome).toBe('exited');
    const bad = run(folder, 'run', 'scenarios/no-such-scenario.json');
    expect(bad.status).toBe(2);
    expect(bad.stderr.trim().split('\n')).toHaveLength(1);
    expect(readdirSync(folder).filter((f) => f.endsWith('.tmp'))).toEqual([]);
  });
});
