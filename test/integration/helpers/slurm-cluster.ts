/**
 * A one-machine Slurm cluster for the integration tests, from Debian's `slurm-wlm` and `munge`:
 * munged, slurmctld and slurmd run in the foreground as children of the test, with every file
 * (key, socket, state, spool, logs, slurm.conf) in one temporary folder and only loopback
 * addresses and free ports. `stop()` cancels the cluster's jobs, stops the daemons, kills any
 * process left working in the folder and removes it; a watchdog shell does the same if the test
 * process dies without calling it.
 */
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import { chmodSync, closeSync, existsSync, mkdirSync, mkdtempSync, openSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { createServer } from 'node:net';
import { hostname, tmpdir } from 'node:os';
import { join } from 'node:path';
import { processesIn, runProgram, sleep, type Ran } from './shell.js';

/** Why the cluster cannot run here (missing packages, a daemon that would not start). */
export class ClusterUnavailable extends Error {}

const DAEMONS = ['munged', 'slurmctld', 'slurmd'] as const;
const CLIENTS = ['sbatch', 'scontrol', 'scancel', 'sinfo', 'squeue'] as const;

/** The absolute path of a program on PATH or in the sbin folders (root's daemons live there). */
function which(name: string): string | undefined {
  const r = spawnSync('sh', ['-c', `PATH="$PATH:/usr/sbin:/sbin" command -v ${name}`], { encoding: 'utf8' });
  return r.status === 0 ? r.stdout.trim() : undefined;
}

/** The programs the cluster needs that are not installed. */
export function missingPrograms(): string[] {
  return [...DAEMONS, ...CLIENTS].filter((p) => !which(p));
}

function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const s = createServer();
    s.on('error', reject);
    s.listen(0, '127.0.0.1', () => {
      const a = s.address();
      s.close(() => (typeof a === 'object' && a ? resolve(a.port) : reject(new Error('no port'))));
    });
  });
}

export interface Cluster {
  /** the cluster's folder; `work` inside it is where jobs are submitted from */
  readonly dir: string;
  readonly work: string;
  /** the environment for Slurm commands: SLURM_CONF points at this cluster */
  readonly env: NodeJS.ProcessEnv;
  /** runs a Slurm client (or any program) against this cluster in `work` */
  run(cmd: string, args: readonly string[]): Promise<Ran>;
  stop(): Promise<void>;
}

async function until(what: string, ok: () => boolean | Promise<boolean>, ms: number, alive: () => string | undefined): Promise<void> {
  const end = Date.now() + ms;
  while (Date.now() < end) {
    if (await ok()) return;
    const dead = alive();
    if (dead) throw new ClusterUnavailable(`${dead} exited while waiting for ${what}`);
    await sleep(200);
  }
  throw new ClusterUnavailable(`timed out after ${ms / 1000} s waiting for ${what}`);
}

function exited(p: ChildProcess): Promise<void> {
  return p.exitCode !== null || p.signalCode !== null ? Promise.resolve() : new Promise((r) => p.once('exit', () => r()));
}

async function stopProcess(p: ChildProcess, ms: number): Promise<void> {
  if (p.exitCode !== null || p.signalCode !== null) return;
  p.kill('SIGTERM');
  const done = await Promise.race([exited(p).then(() => true), sleep(ms).then(() => false)]);
  if (!done) {
    p.kill('SIGKILL');
    await exited(p);
  }
}

const tail = (path: string): string => (existsSync(path) ? readFileSync(path, 'utf8').trim().split('\n').slice(-5).join(' | ') : '(no log)');

/** Starts the cluster; throws ClusterUnavailable (after cleaning up) when it cannot. */
export async function startCluster(): Promise<Cluster> {
  const missing = missingPrograms();
  if (missing.length) throw new ClusterUnavailable(`not installed: ${missing.join(', ')} (apt-get install slurm-wlm munge)`);
  const dir = mkdtempSync(join(tmpdir(), 'foldwise-slurm-'));
  // munged refuses a socket folder that others cannot reach or that others may write to
  chmodSync(dir, 0o755);
  for (const [sub, mode] of [['key', 0o700], ['socket', 0o755], ['state', 0o700], ['spool', 0o700], ['log', 0o755], ['work', 0o755]] as const) {
    mkdirSync(join(dir, sub), { mode });
    chmodSync(join(dir, sub), mode);
  }
  const work = join(dir, 'work');
  const conf = join(dir, 'slurm.conf');
  const socket = join(dir, 'socket', 'munge.socket');
  const env = { ...process.env, SLURM_CONF: conf };
  const daemons = new Map<string, ChildProcess>();
  let watchdog: ChildProcess | undefined;
  let stopped = false;

  const run = (cmd: string, args: readonly string[]): Promise<Ran> => runProgram(cmd, args, { cwd: work, env });
  const stop = async (): Promise<void> => {
    if (stopped) return;
    stopped = true;
    const ctld = daemons.get('slurmctld');
    if (ctld && ctld.exitCode === null && ctld.signalCode === null) {
      // cancel this cluster's jobs (SLURM_CONF names no other controller) and wait for them to end
      await run('scancel', ['--quiet', '--user', 'root']).catch(() => undefined);
      const end = Date.now() + 20_000;
      while (Date.now() < end && (await run('squeue', ['--noheader']).catch(() => ({ stdout: '' }))).stdout.trim() !== '') await sleep(250);
    }
    if (watchdog?.pid && watchdog.exitCode === null) watchdog.kill('SIGKILL');
    for (const name of ['slurmd', 'slurmctld', 'munged']) {
      const p = daemons.get(name);
      if (p) await stopProcess(p, 10_000);
    }
    // anything still working in the folder was started by this cluster's jobs
    for (const p of processesIn(dir)) if (p.pid !== process.pid) try { process.kill(p.pid, 'SIGKILL'); } catch { /* gone */ }
    rmSync(dir, { recursive: true, force: true });
  };
  const start = (name: string, args: string[]): void => {
    const log = openSync(join(dir, 'log', `${name}.out`), 'a');
    const p = spawn(which(name)!, args, { cwd: dir, env, stdio: ['ignore', log, log] });
    closeSync(log);
    p.on('error', () => undefined);
    daemons.set(name, p);
  };
  const dead = (): string | undefined => {
    for (const [name, p] of daemons) if (p.exitCode !== null || p.signalCode !== null) return `${name} (log: ${tail(join(dir, 'log', `${name}.out`))})`;
    return undefined;
  };

  try {
    writeFileSync(join(dir, 'key', 'munge.key'), randomBytes(1024), { mode: 0o400 });
    start('munged', ['--foreground', `--key-file=${join(dir, 'key', 'munge.key')}`, `--socket=${socket}`, `--pid-file=${join(dir, 'socket', 'munged.pid')}`,
      `--log-file=${join(dir, 'log', 'munged.log')}`, `--seed-file=${join(dir, 'key', 'munged.seed')}`]);
    const [ctldPort, dPort] = [await freePort(), await freePort()];
    const host = hostname().split('.')[0];
    writeFileSync(conf, [
      'ClusterName=foldwise-test',
      `SlurmctldHost=${host}(127.0.0.1)`,
      `SlurmctldPort=${ctldPort}`,
      `SlurmdPort=${dPort}`,
      'SlurmUser=root',
      'SlurmdUser=root',
      'AuthType=auth/munge',
      'CredType=cred/munge',
      `AuthInfo=socket=${socket}`,
      `StateSaveLocation=${join(dir, 'state')}`,
      `SlurmdSpoolDir=${join(dir, 'spool')}`,
      `SlurmctldPidFile=${join(dir, 'slurmctld.pid')}`,
      `SlurmdPidFile=${join(dir, 'slurmd.pid')}`,
      `SlurmctldLogFile=${join(dir, 'log', 'slurmctld.log')}`,
      `SlurmdLogFile=${join(dir, 'log', 'slurmd.log')}`,
      // no cgroups, accounting database or MPI: one machine, plain processes
      'ProctrackType=proctrack/linuxproc',
      'TaskPlugin=task/none',
      'SwitchType=switch/none',
      'MpiDefault=none',
      'JobAcctGatherType=jobacct_gather/none',
      'AccountingStorageType=accounting_storage/none',
      'JobCompType=jobcomp/none',
      'SchedulerType=sched/builtin',
      'SelectType=select/cons_tres',
      'SelectTypeParameters=CR_CPU',
      'ReturnToService=2',
      'InactiveLimit=0',
      'KillWait=2',
      // keep finished jobs visible to scontrol for the test's checks
      'MinJobAge=600',
      `NodeName=fwnode NodeHostname=${host} NodeAddr=127.0.0.1 CPUs=2 State=UNKNOWN`,
      'PartitionName=fw Nodes=fwnode Default=YES MaxTime=INFINITE State=UP',
      '',
    ].join('\n'));
    await until('the munge socket', () => existsSync(socket), 15_000, dead);
    start('slurmctld', ['-D', '-i', '-f', conf]);
    start('slurmd', ['-D', '-N', 'fwnode', '-f', conf]);
    // if this process dies without stop(), the daemons follow within seconds
    const pids = [...daemons.values()].map((p) => p.pid).join(' ');
    // and so does whatever is still working in the folder (job steps, submitted scripts)
    const guard = [
      `while kill -0 ${process.pid} 2>/dev/null; do sleep 1; done`,
      `kill -TERM ${pids} 2>/dev/null; sleep 3; kill -KILL ${pids} 2>/dev/null`,
      `for p in /proc/[0-9]*; do case "$(readlink "$p/cwd" 2>/dev/null)" in '${dir}'|'${dir}'/*) kill -KILL "\${p#/proc/}" 2>/dev/null;; esac; done`,
      `rm -rf '${dir}'`,
    ].join('\n');
    watchdog = spawn('sh', ['-c', guard], { cwd: '/', detached: true, stdio: 'ignore' });
    watchdog.unref();
    await until('the node to come up idle', async () => (await run('sinfo', ['--noheader', '--nodes=fwnode', '--format=%t'])).stdout.trim() === 'idle', 60_000, dead);
  } catch (e) {
    const why = e instanceof Error ? e.message : String(e);
    const logs = ['slurmctld.log', 'slurmd.log'].map((l) => `${l}: ${tail(join(dir, 'log', l))}`).join('; ');
    await stop();
    throw new ClusterUnavailable(`${why}; ${logs}`);
  }
  return { dir, work, env, run, stop };
}
