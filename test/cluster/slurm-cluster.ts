/**
 * A real single-node Slurm for the cluster test: Debian's slurm-wlm and munge (installed when missing), one node
 * `localhost` at 127.0.0.1 with 2 CPUs, listening on loopback only, every file in a private folder. The daemons
 * are started and stopped by process ID; they get SIGTERM if the test process dies (setpriv --pdeathsig).
 */
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { chmodSync, chownSync, existsSync, mkdirSync, mkdtempSync, openSync, rmSync, writeFileSync } from 'node:fs';
import { randomFillSync } from 'node:crypto';
import { createServer } from 'node:net';
import { tmpdir, userInfo } from 'node:os';
import { join } from 'node:path';
import { ensureDebianPackages, SetupError } from '../setup/debian.js';

export interface Cluster {
  /** environment for sbatch, squeue, scancel and scontrol: SLURM_CONF of this cluster */
  env: NodeJS.ProcessEnv;
  dir: string;
  /** run a Slurm client command of this cluster; returns stdout */
  run(command: string, args: string[]): string;
  stop(): Promise<void>;
}

async function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const server = createServer();
    server.once('error', reject);
    server.listen(0, '127.0.0.1', () => {
      const address = server.address();
      server.close(() => (typeof address === 'object' && address ? resolve(address.port) : reject(new Error('no port'))));
    });
  });
}

function idOf(name: string, kind: 'u' | 'g'): number {
  const result = spawnSync('id', [`-${kind}`, name], { encoding: 'utf8' });
  if (result.status !== 0) throw new SetupError(`the cluster test needs the ${name} user (from the munge package)`);
  return Number(result.stdout.trim());
}

const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

async function waitFor(what: string, test: () => boolean, seconds: number, log: () => string): Promise<void> {
  for (let waited = 0; waited < seconds * 10; waited += 1) {
    if (test()) return;
    await sleep(100);
  }
  throw new Error(`the test cluster: ${what} within ${seconds} s; ${log()}`);
}

export async function startCluster(): Promise<Cluster> {
  if (userInfo().uid !== 0) throw new SetupError('the cluster test starts slurmd, which must run as root');
  ensureDebianPackages({ program: '/usr/sbin/slurmctld', packages: ['slurm-wlm', 'munge'], purpose: 'the cluster test' });
  ensureDebianPackages({ program: '/usr/sbin/munged', packages: ['munge'], purpose: 'the cluster test' });
  const dir = mkdtempSync(join(tmpdir(), 'railpulse-slurm-'));
  chmodSync(dir, 0o755);
  const munge = join(dir, 'munge');
  for (const sub of ['state', 'spool', 'log', 'munge']) mkdirSync(join(dir, sub));
  const key = join(munge, 'munge.key');
  writeFileSync(key, randomFillSync(Buffer.alloc(1024)), { mode: 0o400 });
  const mungeUid = idOf('munge', 'u');
  const mungeGid = idOf('munge', 'g');
  chownSync(munge, mungeUid, mungeGid);
  chownSync(key, mungeUid, mungeGid);
  const socket = join(munge, 'munge.socket');
  const [controllerPort, nodePort] = [await freePort(), await freePort()];
  const conf = join(dir, 'slurm.conf');
  writeFileSync(join(dir, 'plugstack.conf'), '');
  writeFileSync(
    conf,
    [
      'ClusterName=railpulse-test',
      'SlurmctldHost=localhost',
      `SlurmctldPort=${controllerPort}`,
      `SlurmdPort=${nodePort}`,
      'SlurmUser=root',
      'SlurmdUser=root',
      'AuthType=auth/munge',
      `AuthInfo=socket=${socket}`,
      'CredType=cred/munge',
      'CommunicationParameters=NoCtldInAddrAny,NoInAddrAny',
      `StateSaveLocation=${join(dir, 'state')}`,
      `SlurmdSpoolDir=${join(dir, 'spool')}`,
      `SlurmctldPidFile=${join(dir, 'slurmctld.pid')}`,
      `SlurmdPidFile=${join(dir, 'slurmd.pid')}`,
      `SlurmctldLogFile=${join(dir, 'log', 'slurmctld.log')}`,
      `SlurmdLogFile=${join(dir, 'log', 'slurmd.log')}`,
      `PlugStackConfig=${join(dir, 'plugstack.conf')}`,
      'ProctrackType=proctrack/linuxproc',
      'TaskPlugin=task/none',
      'SelectType=select/cons_tres',
      'SelectTypeParameters=CR_Core',
      'AccountingStorageType=accounting_storage/none',
      'JobAcctGatherType=jobacct_gather/none',
      'JobCompType=jobcomp/none',
      'MpiDefault=none',
      'ReturnToService=2',
      'KillWait=30',
      'MinJobAge=3600',
      'NodeName=localhost NodeAddr=127.0.0.1 CPUs=2 State=UNKNOWN',
      'PartitionName=test Nodes=localhost Default=YES MaxTime=INFINITE State=UP',
      '',
    ].join('\n'),
  );
  const env = { ...process.env, SLURM_CONF: conf };
  const daemons: ChildProcess[] = [];
  const daemon = (name: string, args: string[]): ChildProcess => {
    const out = openSync(join(dir, 'log', `${name}.out`), 'a');
    const child = spawn('setpriv', args, { env, stdio: ['ignore', out, out] });
    daemons.push(child);
    return child;
  };
  const logs = () => ['munged', 'slurmctld', 'slurmd'].map((n) => `${n}: ${spawnSync('tail', ['-n', '3', join(dir, 'log', `${n}.out`)], { encoding: 'utf8' }).stdout.trim()}`).join(' | ');
  const cluster: Cluster = {
    env,
    dir,
    run(command, args) {
      const result = spawnSync(command, args, { env, encoding: 'utf8', timeout: 60_000 });
      if (result.status !== 0) throw new Error(`${command} ${args.join(' ')}: ${result.stderr.trim() || result.error?.message}`);
      return result.stdout;
    },
    async stop() {
      // Jobs first (their processes belong to slurmstepd, not to the daemons), then the daemons by process ID.
      spawnSync('scancel', ['--partition=test'], { env, timeout: 30_000 });
      for (let waited = 0; waited < 600; waited += 1) {
        const queue = spawnSync('squeue', ['-h', '-o', '%i'], { env, encoding: 'utf8', timeout: 10_000 });
        if (queue.status !== 0 || queue.stdout.trim() === '') break;
        await sleep(100);
      }
      for (const child of daemons.reverse()) {
        if (child.exitCode !== null || child.signalCode !== null) continue;
        child.kill('SIGTERM');
        const exited = new Promise((resolve) => child.once('exit', resolve));
        const timer = setTimeout(() => child.kill('SIGKILL'), 15_000);
        await exited;
        clearTimeout(timer);
      }
      rmSync(dir, { recursive: true, force: true });
    },
  };
  try {
    daemon('munged', [`--reuid=${mungeUid}`, `--regid=${mungeGid}`, '--clear-groups', '--pdeathsig', 'SIGTERM', 'munged', '--foreground', `--socket=${socket}`, `--key-file=${key}`, `--pid-file=${join(munge, 'munged.pid')}`, `--log-file=${join(munge, 'munged.log')}`, `--seed-file=${join(munge, 'munged.seed')}`]);
    await waitFor('munged did not open its socket', () => existsSync(socket), 30, logs);
    daemon('slurmctld', ['--pdeathsig', 'SIGTERM', 'slurmctld', '-D', '-f', conf]);
    await waitFor('slurmctld did not answer', () => spawnSync('scontrol', ['ping'], { env, encoding: 'utf8' }).stdout.includes('UP'), 60, logs);
    daemon('slurmd', ['--pdeathsig', 'SIGTERM', 'slurmd', '-D', '-N', 'localhost', '-f', conf]);
    await waitFor('the node did not become idle', () => /idle/.test(spawnSync('sinfo', ['-h', '-o', '%t'], { env, encoding: 'utf8' }).stdout), 60, logs);
  } catch (error) {
    await cluster.stop();
    throw error;
  }
  return cluster;
}
