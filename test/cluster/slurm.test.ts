/**
 * A study on a real single-node Slurm, submitted with the shipped scripts (scripts/slurm/): 4 shards as a job
 * array with a dependent merge; one task is cancelled mid-run (scancel sends SIGTERM: the sweep saves what it ran),
 * the merge that follows names the shard and the points it lacks, the task is resubmitted alone
 * (--array=3, where SLURM_ARRAY_TASK_COUNT is 1) and continues its folder, and the merged study equals the
 * unsharded run byte for byte. Plus the job script's own checks, without a scheduler.
 *
 * Never skipped in CI. Locally, RAILPULSE_SKIP_SLURM=1 skips the scheduler part (CI does not set it, and it is
 * ignored when CI is set).
 */
import { spawnSync } from 'node:child_process';
import { chmodSync, existsSync, mkdtempSync, readFileSync, readdirSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startCluster, type Cluster } from './slurm-cluster.js';

const ROOT = resolve('.');
const SCENARIO = 'test/study/fixtures/two-group.json';
// 3,000 points: each shard runs 750, long enough to be caught mid-run on a busy machine.
const VARY = ['--vary', 'bank[0].voltage=2kV:4kV:60', '--vary', 'armature.mass=10g:20g:50'];
const SHARDS = 4;
const skipScheduler = process.env.RAILPULSE_SKIP_SLURM === '1' && !process.env.CI;

const sleep = (ms: number) => new Promise((done) => setTimeout(done, ms));
const lines = (path: string): number => (existsSync(path) ? readFileSync(path, 'utf8').split('\n').length - 1 : 0);

describe('the Slurm job script without a scheduler', () => {
  const dir = mkdtempSync(join(tmpdir(), 'railpulse-shard-script-'));
  // a stand-in for node that prints the arguments the job script would run railpulse with
  const fakeNode = join(dir, 'fake-node');
  writeFileSync(fakeNode, '#!/bin/sh\nprintf "%s\\n" "$@"\n');
  chmodSync(fakeNode, 0o755);
  writeFileSync(join(dir, 'sweep.args'), `${[SCENARIO, ...VARY].join('\0')}\0`);
  const shard = (task: string | undefined, args: string[], extra: Record<string, string> = {}) => {
    const env: NodeJS.ProcessEnv = { ...process.env, RAILPULSE_HOME: ROOT, RAILPULSE_NODE: fakeNode };
    delete env.SLURM_CPUS_PER_TASK;
    Object.assign(env, extra);
    if (task === undefined) delete env.SLURM_ARRAY_TASK_ID;
    else env.SLURM_ARRAY_TASK_ID = task;
    return spawnSync('bash', ['scripts/slurm/sweep-shard.sbatch', ...args], { env, encoding: 'utf8' });
  };

  it('runs node on bin/railpulse.js with the shard from the task ID and the count given, and one job without --cpus-per-task', () => {
    const result = shard('3', [dir, '4']);
    expect(result.status).toBe(0);
    const args = result.stdout.trimEnd().split('\n');
    expect(args[0]).toBe(join(ROOT, 'bin/railpulse.js'));
    expect(args.slice(1)).toEqual(['sweep', SCENARIO, ...VARY, '--shard', '3/4', '--jobs', '1', '--out', join(dir, 'shard-3')]);
    expect(shard('3', [dir, '4'], { SLURM_CPUS_PER_TASK: '8' }).stdout).toContain('--jobs\n8\n');
  });

  it('a 0-based array needs index base 0; an ID outside the shards is refused with one line, exit 2', () => {
    const zero = shard('0', [dir, '4']);
    expect(zero.status).toBe(2);
    expect(zero.stderr.trim()).toMatch(/^railpulse shard: array task 0 is not one of the 4 shards \(task IDs 1-4 with index base 1\)$/);
    expect(shard('0', [dir, '4', '0']).stdout).toContain('--shard\n1/4\n');
    expect(shard('4', [dir, '4', '0']).status).toBe(2);
    expect(shard(undefined, [dir, '4']).stderr).toMatch(/not an array task/);
    expect(shard('1', [dir, 'four']).stderr).toMatch(/shard count must be a whole number/);
  });
});

describe.skipIf(skipScheduler)('a study on a real single-node Slurm', () => {
  let cluster: Cluster;
  const work = mkdtempSync(join(tmpdir(), 'railpulse-cluster-study-'));

  beforeAll(async () => {
    cluster = await startCluster();
  }, 20 * 60_000);

  afterAll(async () => {
    await cluster?.stop();
  }, 120_000);

  const submit = (args: string[]): string => {
    const result = spawnSync('bash', ['scripts/slurm/submit-study.sh', ...args], { env: cluster.env, encoding: 'utf8', cwd: ROOT });
    expect(result.stderr).toBe('');
    expect(result.status).toBe(0);
    return result.stdout;
  };
  const jobState = (job: string): string => /JobState=(\S+)/.exec(cluster.run('scontrol', ['show', 'job', job]))?.[1] ?? '?';
  const waitUntilIdle = async (jobs: string[], seconds: number) => {
    for (let waited = 0; waited < seconds * 2; waited += 1) {
      if (jobs.every((job) => !/PENDING|RUNNING|COMPLETING|CONFIGURING|REQUEUED/.test(cluster.run('scontrol', ['show', 'job', job])))) return;
      await sleep(500);
    }
    throw new Error(`jobs ${jobs.join(', ')} still running after ${seconds} s: ${cluster.run('squeue', [])}`);
  };

  it('4 shards, one cancelled mid-run and resubmitted alone, merge to the unsharded study byte for byte', async () => {
    const reference = join(work, 'reference');
    const whole = spawnSync(process.execPath, ['bin/railpulse.js', 'sweep', SCENARIO, ...VARY, '--jobs', '2', '--no-report', '--out', reference], { encoding: 'utf8' });
    expect(whole.status).toBe(0);

    const study = join(work, 'study');
    const submitted = submit(['--shards', String(SHARDS), '--dir', study, '--', SCENARIO, ...VARY]);
    const [, arrayJob, mergeJob] = /^array job (\d+) \(shards 1-4 of 4\), merge job (\d+)/.exec(submitted) ?? [];
    expect(arrayJob && mergeJob).toBeTruthy();

    // cancel task 3 once it has saved some points (scancel: SIGTERM to the node process the job script exec'd)
    const shard3 = join(study, 'shard-3', 'points.jsonl');
    for (let waited = 0; lines(shard3) === 0; waited += 1) {
      if (waited > 2400) throw new Error('task 3 wrote nothing in 20 minutes');
      await sleep(500);
    }
    cluster.run('scancel', [`${arrayJob}_3`]);
    await waitUntilIdle([`${arrayJob}_1`, `${arrayJob}_2`, `${arrayJob}_3`, `${arrayJob}_4`, mergeJob!], 1200);

    expect(jobState(`${arrayJob}_3`)).toBe('CANCELLED');
    const savedByTask3 = lines(shard3);
    expect(savedByTask3).toBeGreaterThan(0);
    expect(savedByTask3).toBeLessThan(750);
    const logs = readdirSync(join(study, 'logs'));
    const task3Log = readFileSync(join(study, 'logs', logs.find((f) => f.startsWith('shard-3-'))!), 'utf8');
    expect(task3Log).toMatch(/stopping \(SIGTERM\)/);
    // the merge ran anyway (afterany), and says which shard lacks which points instead of waiting forever
    expect(jobState(mergeJob!)).toBe('FAILED');
    const mergeLog = readFileSync(join(study, 'logs', `merge-job${mergeJob}.out`), 'utf8');
    expect(mergeLog).toContain(`shard 3/4 (${join(study, 'shard-3')}) has ${savedByTask3} of its 750 points, lacking ${750 - savedByTask3} (indices ${2 + 4 * savedByTask3}, `);
    expect(existsSync(join(study, 'merged'))).toBe(false);

    // resubmit task 3 alone: it continues its folder, and a new merge follows it
    const again = submit(['--resubmit', '3', '--dir', study]);
    const [, arrayJob2, mergeJob2] = /^array job (\d+) \(shards 3 of 4\), merge job (\d+)/.exec(again) ?? [];
    await waitUntilIdle([`${arrayJob2}_3`, mergeJob2!], 1200);
    expect(jobState(`${arrayJob2}_3`)).toBe('COMPLETED');
    expect(jobState(mergeJob2!)).toBe('COMPLETED');
    const resumedLog = readFileSync(join(study, 'logs', `shard-3-job${arrayJob2}.out`), 'utf8');
    expect(resumedLog).toContain(`continued the study already in ${join(study, 'shard-3')}: ${savedByTask3} of its 750 points were there`);

    for (const file of ['points.jsonl', 'points.csv']) {
      expect(readFileSync(join(study, 'merged', file), 'utf8')).toBe(readFileSync(join(reference, file), 'utf8'));
    }
  }, 40 * 60_000);
});
