/**
 * Sweeping rail and armature geometry: those values become L′, R′, the diffusion cells and the armature's mass and
 * resistance when a file is read, so each point is the file read again with its values. Reference: the same
 * scenario written to a file with each point's values and run on its own (`run --json`) — a sweep point must agree
 * with it exactly, and must differ from the nominal where L′ changes (the defect this guards: every point once ran
 * at the nominal L′).
 */
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { railpulse } from '../measure/cli-fixture.js';

const dir = mkdtempSync(join(tmpdir(), 'railpulse-geometry-sweep-'));
const base = JSON.parse(readFileSync('scenarios/geometry-shot.json', 'utf8')) as Record<string, any>;
delete base.$schema;

function rows(folder: string): Record<string, string>[] {
  const [head, ...lines] = readFileSync(join(folder, 'points.csv'), 'utf8').trim().split('\n');
  const keys = head!.split(',');
  return lines.map((line) => Object.fromEntries(line.split(',').map((cell, k) => [keys[k]!, cell])));
}

function runAlone(edit: (s: Record<string, any>) => void): Record<string, any> {
  const copy = structuredClone(base);
  edit(copy);
  const file = join(dir, `point-${Math.random().toString(36).slice(2)}.json`);
  writeFileSync(file, JSON.stringify(copy));
  const result = railpulse(['run', file, '--json', '--no-report']);
  expect(result.status, result.stderr).toBe(0);
  return JSON.parse(result.stdout);
}

describe('a sweep over geometry reads each point again', () => {
  it('rail separation × armature length: every point equals its own file run alone', () => {
    const out = join(dir, 'grid');
    const result = railpulse(['sweep', 'scenarios/geometry-shot.json', '--vary', 'rails.geometry.separation=10mm,20mm', '--vary', 'armature.geometry.length=15mm,25mm', '--out', out, '--no-report', '--jobs', '2']);
    expect(result.status, result.stderr).toBe(0);
    const points = rows(out);
    expect(points).toHaveLength(4);
    const velocities = new Set<string>();
    for (const point of points) {
      const separation = Number(point['rails.geometry.separation']);
      const length = Number(point['armature.geometry.length']);
      const alone = runAlone((s) => {
        s.rails.geometry.separation = separation;
        s.armature.geometry.length = length;
      });
      expect(Number(point.muzzleVelocity)).toBe(alone.muzzleVelocity);
      expect(Number(point['energy.losses.rails'])).toBe(alone.energy.losses.rails);
      expect(Number(point.peakCurrent)).toBe(alone.peakCurrent);
      velocities.add(point.muzzleVelocity!);
    }
    // wider rails (larger L′) and a lighter armature both change the launch: four different velocities
    expect(velocities.size).toBe(4);
  });

  it('mixes with paths set on the read scenario, and samples (Latin hypercube) as well as grids', () => {
    const out = join(dir, 'lhs');
    const result = railpulse(['sweep', 'scenarios/geometry-shot.json', '--design', 'lhs', '--samples', '3', '--seed', '7', '--vary', 'rails.geometry.height=12mm:18mm:2', '--vary', 'bank[0].voltage=8kV:10kV:2', '--out', out, '--no-report']);
    expect(result.status, result.stderr).toBe(0);
    for (const point of rows(out)) {
      const alone = runAlone((s) => {
        s.rails.geometry.height = Number(point['rails.geometry.height']);
        s.bank[0].voltage = Number(point['bank[0].voltage']);
      });
      expect(Number(point.muzzleVelocity)).toBe(alone.muzzleVelocity);
    }
  });

  it('a geometry the field solution refuses is one line and exit 2 before anything runs', () => {
    const result = railpulse(['sweep', 'scenarios/geometry-shot.json', '--vary', 'rails.geometry.separation=0.1mm,15mm', '--out', join(dir, 'never')]);
    expect(result.status).toBe(2);
    expect(result.stderr.trim().split('\n')).toHaveLength(1);
    expect(result.stderr).toMatch(/--vary: rails\.geometry\.separation = 0\.0001 \(SI\) is not allowed: .*50 times smaller/);
  });
});
