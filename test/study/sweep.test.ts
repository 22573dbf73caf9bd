import { appendFileSync, mkdirSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { dimensionOfPath, loadScenarioFile, validateScenario } from '../../src/scenario/load.js';
import { runShot } from '../../src/solve/shot.js';
import { merge } from '../../src/study/merge.js';
import { parsePath, setPath } from '../../src/scenario/paths.js';
import { makeSweepPlan, type SweepChoices } from '../../src/study/plan.js';
import { assessShot } from '../../src/checks/assess.js';
import { csvLine, studyLayout } from '../../src/study/rows.js';
import { runSweep } from '../../src/study/sweep.js';
import { TWO_GROUP_FILE } from './fixtures.js';

const loaded = loadScenarioFile(TWO_GROUP_FILE);
const VARY = ['bank[0].voltage=2kV:4kV:3', 'bank[1].trigger=0us,100us,200us', 'armature.mass=10g,15g'];
const root = mkdtempSync(join(tmpdir(), 'railpulse-sweep-'));
let counter = 0;

function plan(extra: Partial<SweepChoices> = {}) {
  counter += 1;
  return makeSweepPlan({
    scenario: loaded.scenario,
    source: { file: TWO_GROUP_FILE, sha256: loaded.sha256 },
    vary: VARY,
    dimensionOf: dimensionOfPath,
    out: join(root, `run${counter}`),
    now: new Date('2026-01-01T00:00:00Z'),
    ...extra,
  });
}

const read = (dir: string, file: string): string => readFileSync(join(dir, file), 'utf8');
const validate = (scenario: Parameters<typeof validateScenario>[0]) => validateScenario(scenario);

describe('sweep', () => {
  let reference = '';
  let referenceCsv = '';

  it('each row equals a single runShot of the same point, exactly (same SI inputs, same solver)', async () => {
    const p = plan();
    const summary = await runSweep(p, { jobs: 2, validate });
    expect(summary).toMatchObject({ points: 18, ran: 18, failed: 0, complete: true });
    reference = read(p.outDir, 'points.jsonl');
    referenceCsv = read(p.outDir, 'points.csv');
    const rows = reference.trimEnd().split('\n').map((line) => JSON.parse(line) as Record<string, unknown>);
    expect(rows.map((row) => row.index)).toEqual(Array.from({ length: 18 }, (_, i) => i));
    for (const index of [0, 7, 17]) {
      const scenario = structuredClone(loaded.scenario);
      const point = p.design.point(index);
      p.design.axes.forEach((axis, d) => setPath(scenario, parsePath(axis.path)!, point[d]!));
      const { index: rowIndex, ...rest } = rows[index]!;
      const shot = runShot(scenario, { waveforms: false });
      // the verdicts come from the same assessment a shot record shows
      const assessment = assessShot(scenario, shot);
      const expected = {
        ...Object.fromEntries(p.design.axes.map((axis, d) => [axis.path, point[d]])),
        ...shot.results,
        verdict: assessment.status.verdict,
        verdicts: Object.fromEntries(assessment.checks.map((c) => [c.id, c.verdict])),
        warnings: assessment.warnings.map((w) => w.id),
      };
      expect(rowIndex).toBe(index);
      expect(rest).toEqual(JSON.parse(JSON.stringify(expected)));
    }
    // CSV: header + one line a point, each rebuilt identically from its JSONL row; one verdict column a check id
    const layout = studyLayout(loaded.scenario, p.design.axes.map((axis) => axis.path));
    const header = referenceCsv.split('\n')[0]!.split(',');
    expect(header).toContain('energy.losses.rails');
    expect(header).toContain('modules[1].reversal');
    expect(header.slice(header.indexOf('verdict'))).toEqual([
      'verdict',
      ...assessShot(loaded.scenario, runShot(loaded.scenario, { waveforms: false })).checks.map((c) => `verdicts.${c.id}`),
      'warnings',
      'error',
    ]);
    expect(header).toEqual(p.manifest.columns);
    expect(referenceCsv).toBe(readFileSync(join(p.outDir, 'points.csv'), 'utf8'));
    expect(referenceCsv.split('\n').slice(1).join('\n')).toBe(rows.map((row) => csvLine(layout, row)).join(''));
  });

  it('output order does not depend on --jobs or batch size', async () => {
    const one = plan();
    await runSweep(one, { jobs: 1, batchSize: 5, validate });
    expect(read(one.outDir, 'points.jsonl')).toBe(reference);
    expect(read(one.outDir, 'points.csv')).toBe(referenceCsv);
  });

  it('shards 1/3, 2/3, 3/3 merged equal the unsharded run byte for byte', async () => {
    const dirs: string[] = [];
    for (let index = 1; index <= 3; index += 1) {
      const shard = plan({ shard: { index, count: 3 } });
      const summary = await runSweep(shard, { jobs: 2, validate });
      expect(summary.points).toBe(6);
      const indices = read(shard.outDir, 'points.jsonl').trimEnd().split('\n').map((line) => (JSON.parse(line) as { index: number }).index);
      expect(indices.every((i) => i % 3 === index - 1)).toBe(true);
      dirs.push(shard.outDir);
    }
    const out = join(root, 'merged');
    merge([dirs[2]!, dirs[0]!, dirs[1]!], out);
    expect(read(out, 'points.jsonl')).toBe(reference);
    expect(read(out, 'points.csv')).toBe(referenceCsv);

    // a shard missing, or given twice: refused, naming the index
    expect(() => merge([dirs[0]!, dirs[1]!], join(root, 'merged-missing'))).toThrow(/shard 3\/3 is not among the folders given/);
    expect(() => merge([dirs[0]!, dirs[1]!, dirs[2]!, dirs[1]!], join(root, 'merged-twice'))).toThrow(/is shard 2\/3 like/);
    // a different study is refused
    const other = plan({ vary: ['armature.mass=10g,15g'], shard: { index: 1, count: 2 } });
    await runSweep(other, { jobs: 1, validate });
    expect(() => merge([dirs[0]!, other.outDir], join(root, 'merged-other'))).toThrow(/different study/);
  });

  it('--resume cuts a half-written row, keeps finished ones, and ends with every point exactly once', async () => {
    const p = plan();
    // Pretend a run was killed after 5 points: 5 complete JSONL rows plus half a row, CSV one row ahead.
    const lines = reference.split('\n');
    await runSweep({ ...p, design: p.design }, { jobs: 1, signal: AbortSignal.abort(), validate });
    writeFileSync(join(p.outDir, 'points.jsonl'), `${lines.slice(0, 5).join('\n')}\n${lines[5]!.slice(0, 40)}`);
    const csvLines = referenceCsv.split('\n');
    writeFileSync(join(p.outDir, 'points.csv'), `${csvLines.slice(0, 7).join('\n')}\n`);
    const summary = await runSweep({ ...p, resume: true }, { jobs: 2, validate });
    expect(summary).toMatchObject({ resumedFrom: 5, ran: 13, complete: true });
    expect(read(p.outDir, 'points.jsonl')).toBe(reference);
    expect(read(p.outDir, 'points.csv')).toBe(referenceCsv);
    // resuming a finished study runs nothing
    expect(await runSweep({ ...p, resume: true }, { jobs: 2 })).toMatchObject({ ran: 0, complete: true });
  });

  it('continues a folder that holds the same study without --resume, and refuses a folder that holds anything else', async () => {
    const p = plan();
    await runSweep(p, { jobs: 1, signal: AbortSignal.abort() });
    appendFileSync(join(p.outDir, 'points.jsonl'), '');
    // the same study (a requeued cluster task, the same command run again): continued, every point once
    const again = await runSweep(p, { jobs: 1 });
    expect(again).toMatchObject({ autoResumed: true, complete: true });
    expect(read(p.outDir, 'points.jsonl')).toBe(reference);
    // another study in that folder, with or without --resume: refused
    const otherPlain = makeSweepPlan({ scenario: loaded.scenario, source: { file: TWO_GROUP_FILE, sha256: loaded.sha256 }, vary: ['armature.mass=1g,2g'], dimensionOf: dimensionOfPath, out: p.outDir });
    await expect(runSweep(otherPlain, { jobs: 1 })).rejects.toThrow(/holds a different study/);
    const stranger = join(root, 'not-a-study');
    mkdirSync(stranger);
    writeFileSync(join(stranger, 'notes.txt'), 'mine');
    await expect(runSweep({ ...plan(), outDir: stranger }, { jobs: 1 })).rejects.toThrow(/exists and is not a study folder/);
    const other = makeSweepPlan({ scenario: loaded.scenario, source: { file: TWO_GROUP_FILE, sha256: loaded.sha256 }, vary: ['armature.mass=1g,2g'], dimensionOf: dimensionOfPath, out: p.outDir, resume: true });
    await expect(runSweep(other, { jobs: 1 })).rejects.toThrow(/holds a different study/);
  });

  it('a point that fails the range checks is recorded with its reason, not run', async () => {
    const p = plan({ vary: ['friction.coefficient=0.1,0.3', 'friction.staticCoefficient=0.2'] });
    await runSweep(p, { jobs: 1, validate });
    const rows = read(p.outDir, 'points.jsonl').trimEnd().split('\n').map((line) => JSON.parse(line) as Record<string, unknown>);
    expect(rows[0]!.error).toBeUndefined();
    expect(String(rows[1]!.error)).toMatch(/staticCoefficient|static/i);
  });

  it('checking the points in the workers (validatePoints) writes the same rows as checking them in the main thread', async () => {
    const vary = ['friction.coefficient=0.1,0.15,0.3', 'friction.staticCoefficient=0.2,0.25', 'bank[0].voltage=2kV:4kV:3'];
    const main = plan({ vary });
    const workers = plan({ vary });
    await runSweep(main, { jobs: 2, batchSize: 4, validate });
    const summary = await runSweep(workers, { jobs: 2, batchSize: 4, validatePoints: true });
    expect(summary.failed).toBeGreaterThan(0);
    expect(summary.failed).toBeLessThan(summary.points);
    expect(read(workers.outDir, 'points.jsonl')).toBe(read(main.outDir, 'points.jsonl'));
    expect(read(workers.outDir, 'points.csv')).toBe(read(main.outDir, 'points.csv'));
  });

  it('the worker bundle carries the solver, the checks and the range checks but not mathjs (it costs ~1 s a thread to import)', () => {
    const bundle = readFileSync(new URL('../../dist/sweep-worker.mjs', import.meta.url), 'utf8');
    expect(bundle).toContain('// src/solve/shot.ts');
    expect(bundle).toContain('// src/checks/assess.ts');
    expect(bundle).toContain('// src/scenario/validate.ts');
    // the quantity reader may come along (validation's field table), but mathjs only ever loads on demand
    expect(bundle).not.toMatch(/\/\/ (node_modules\/mathjs|src\/units\/unit-library-entry)/);
  });
});

describe('sweep columns of the shot effects', () => {
  // the geometry demo with every effect on (invented demo values for the transition threshold)
  const raw = JSON.parse(readFileSync('scenarios/geometry-shot.json', 'utf8')) as Record<string, unknown> & { armature: Record<string, unknown> };
  const withEffects = {
    ...raw,
    heating: 'adiabatic',
    armature: { ...raw.armature, transition: { specificAction: '5e14 A^2*s/m^4', contactArea: '3 cm^2', arcDrop: '60 V' } },
  };
  const dir = mkdtempSync(join(tmpdir(), 'railpulse-effects-'));
  const file = join(dir, 'effects.json');
  writeFileSync(file, JSON.stringify(withEffects));
  const effects = loadScenarioFile(file);

  it('a study has a column for each effect the scenario turns on, filled from the shot, and keeps them through shards and merge', async () => {
    const choices = (out: string, extra: Partial<SweepChoices> = {}) =>
      makeSweepPlan({ scenario: effects.scenario, source: { file, sha256: effects.sha256 }, vary: ['bank[0].voltage=8kV,9kV'], dimensionOf: dimensionOfPath, out: join(dir, out), now: new Date('2026-01-01T00:00:00Z'), ...extra });
    const whole = choices('whole');
    await runSweep(whole, { jobs: 1, validate });
    const header = read(whole.outDir, 'points.csv').split('\n')[0]!.split(',');
    for (const column of ['energy.afterExit', 'energy.railInterior', 'transitionTime', 'transitionPosition', 'armatureTemperature', 'railTemperature']) {
      expect(header).toContain(column);
    }
    const rows = read(whole.outDir, 'points.jsonl').trimEnd().split('\n').map((line) => JSON.parse(line) as Record<string, unknown>);
    const shot = runShot(structuredClone(effects.scenario), { waveforms: false });
    const csvRow = read(whole.outDir, 'points.csv').split('\n')[2]!.split(',');
    // the 9 kV point is the scenario itself: its effect cells are the shot's own figures
    expect(Number(csvRow[header.indexOf('transitionTime')])).toBe(shot.results.transitionTime);
    expect(Number(csvRow[header.indexOf('railTemperature')])).toBe(shot.results.railTemperature);
    expect(Number(csvRow[header.indexOf('energy.afterExit')])).toBe(shot.results.energy.afterExit);
    expect(rows[1]!.transitionTime).toBe(shot.results.transitionTime);
    // a scenario with none of the options: only the energy after exit
    const plainHeader = studyLayout(loaded.scenario, ['armature.mass']).columns;
    expect(plainHeader).toContain('energy.afterExit');
    expect(plainHeader).not.toContain('transitionTime');
    expect(plainHeader).not.toContain('energy.railInterior');
    // shards merge into the same file
    const shards = [1, 2].map((k) => choices(`shard${k}`, { shard: { index: k, count: 2 } }));
    for (const shard of shards) await runSweep(shard, { jobs: 1, validate });
    const merged = join(dir, 'merged');
    merge(shards.map((shard) => shard.outDir), merged);
    expect(read(merged, 'points.csv')).toBe(read(whole.outDir, 'points.csv'));
  });
});
