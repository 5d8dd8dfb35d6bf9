import { execFile, spawnSync } from 'node:child_process';
import { existsSync, readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';

// Drives a real Slurm cluster from tests through its command-line clients (sbatch, squeue,
// scontrol, scancel), each call with a timeout. The cluster is the one named by SLURM_CONF, or
// else by the file that `bash .ci/slurm.sh start` writes; a system-wide /etc/slurm is never used
// by accident. No accounting is assumed: states come from squeue and `scontrol show job` only.

/** Written by `.ci/slurm.sh start`: `export SLURM_CONF=...` and the cluster's folder. */
export const SLURM_ENV_FILE = fileURLToPath(new URL('../../.ci/.slurm-env', import.meta.url));

/** What a developer runs to get a test cluster. */
export const SLURM_START_HINT = 'bash .ci/slurm.sh start';

/** Job states after which Slurm changes nothing more (squeue(1), JOB STATE CODES). */
export const FINAL_JOB_STATES: ReadonlySet<string> = new Set([
  'BOOT_FAIL', 'CANCELLED', 'COMPLETED', 'DEADLINE', 'FAILED', 'NODE_FAIL', 'OUT_OF_MEMORY',
  'PREEMPTED', 'TIMEOUT',
]);

export interface SlurmCluster {
  /** The slurm.conf every client call is pointed at. */
  readonly conf: string;
  /** Where `conf` came from: the SLURM_CONF variable or the env file. */
  readonly source: string;
  /** The environment for the clients: this process's, SLURM_CONF set, inherited job variables removed. */
  readonly env: NodeJS.ProcessEnv;
}

export type SlurmLookup =
  | { readonly ok: true; readonly cluster: SlurmCluster }
  | { readonly ok: false; readonly reason: string };

/** One record of `scontrol show job -o`: one job, one array task, or the still-pending rest of an array. */
export interface SlurmJobRecord {
  readonly jobId: string;
  readonly arrayJobId?: string;
  /** A single task id ("2"), or a range/list ("2-5", "3,7%2") for array tasks still pending together. */
  readonly arrayTaskId?: string;
  readonly state: string;
  readonly reason: string;
  /** "status:signal", e.g. "0:0" for success, "0:15" for SIGTERM. */
  readonly exitCode: string;
  readonly stdOut?: string;
}

export interface SubmitArrayOptions {
  /** sbatch --array, e.g. "0-2". */
  readonly array: string;
  /** sbatch --output; %A is the array's job id, %a the task id. */
  readonly output: string;
  readonly chdir: string;
  readonly jobName?: string;
  /** sbatch --time in minutes: Slurm ends a forgotten task after this. */
  readonly timeMinutes?: number;
  /** Arguments passed to the script. */
  readonly scriptArgs?: readonly string[];
}

export interface WaitOptions {
  readonly timeoutMs?: number;
  readonly pollMs?: number;
}

/** True when a missing cluster must fail the tests instead of skipping them (CI, or asked for). */
export function slurmRequired(env: NodeJS.ProcessEnv = process.env): boolean {
  return isSet(env.ARCSIFT_REQUIRE_SLURM) || isSet(env.CI);
}

function isSet(value: string | undefined): boolean {
  return value !== undefined && value !== '' && value !== '0' && value.toLowerCase() !== 'false';
}

/** The SLURM_CONF line of the env file, or undefined when there is no such file or line. */
export function readSlurmEnvFile(path: string = SLURM_ENV_FILE): string | undefined {
  if (!existsSync(path)) return undefined;
  for (const line of readFileSync(path, 'utf8').split('\n')) {
    const match = /^\s*(?:export\s+)?SLURM_CONF=(.+?)\s*$/.exec(line);
    if (match) return match[1].replace(/^(["'])(.*)\1$/, '$2');
  }
  return undefined;
}

/** Environment for the clients: SLURM_CONF set, and no SLURM_*, SBATCH_* or SQUEUE_* inherited from an enclosing job. */
function clientEnv(conf: string): NodeJS.ProcessEnv {
  const env: NodeJS.ProcessEnv = {};
  for (const [key, value] of Object.entries(process.env)) {
    if (!/^(SLURM|SBATCH|SQUEUE|SCANCEL|SCONTROL)_/.test(key)) env[key] = value;
  }
  env.SLURM_CONF = conf;
  return env;
}

/**
 * Looks for a reachable cluster: a slurm.conf (SLURM_CONF, else the env file), sbatch on PATH,
 * a controller that answers sinfo within 10 s and a node that can take jobs. Synchronous, for
 * use at test collection.
 */
export function findSlurmCluster(): SlurmLookup {
  const fromVariable = process.env.SLURM_CONF;
  const conf = fromVariable || readSlurmEnvFile();
  const source = fromVariable ? 'SLURM_CONF' : SLURM_ENV_FILE;
  if (!conf) return { ok: false, reason: `no SLURM_CONF and no ${SLURM_ENV_FILE}` };
  if (!existsSync(conf)) return { ok: false, reason: `${conf} (from ${source}) does not exist` };
  const env = clientEnv(conf);
  const sbatch = spawnSync('sbatch', ['--version'], { env, encoding: 'utf8', timeout: 10_000 });
  if (sbatch.error || sbatch.status !== 0) return { ok: false, reason: 'sbatch is not on PATH' };
  const sinfo = spawnSync('sinfo', ['-h', '-N', '-o', '%N %T'], { env, encoding: 'utf8', timeout: 10_000 });
  if (sinfo.status !== 0) {
    const said = (sinfo.stderr || sinfo.error?.message || 'no answer').trim().split('\n')[0];
    return { ok: false, reason: `the controller of ${conf} does not answer sinfo (${said})` };
  }
  // A node that can take jobs; a suffix such as "*" (not responding) or a down/drained state would
  // leave every test waiting for its whole timeout.
  const nodes = sinfo.stdout.trim().split('\n').filter((line) => line !== '');
  if (!nodes.some((line) => /\s(idle|mixed|allocated|completing)$/.test(line))) {
    return { ok: false, reason: `no node of ${conf} can take jobs (sinfo: ${nodes.join(', ') || 'no nodes'})` };
  }
  return { ok: true, cluster: { conf, source, env } };
}

/** The reachable cluster, or an Error that says why there is none and how to start one. */
export function requireSlurmCluster(): SlurmCluster {
  const found = findSlurmCluster();
  if (found.ok) return found.cluster;
  throw new Error(`no Slurm cluster is reachable: ${found.reason}; start one with \`${SLURM_START_HINT}\``);
}

/** Runs one Slurm client and returns its standard output; rejects naming the command on failure or timeout. */
export function runSlurm(cluster: SlurmCluster, command: string, args: readonly string[], timeoutMs = 30_000): Promise<string> {
  return new Promise((resolve, reject) => {
    execFile(command, args, { env: cluster.env, encoding: 'utf8', timeout: timeoutMs }, (error, stdout, stderr) => {
      if (!error) return resolve(stdout);
      const line = `${command} ${args.join(' ')}`;
      const why = error.killed ? `timed out after ${timeoutMs} ms` : `failed (${error.code ?? error.signal}): ${stderr.trim() || error.message}`;
      reject(new Error(`${line} ${why}`));
    });
  });
}

/** The job id in `sbatch --parsable` output ("123" or "123;cluster"). */
export function parseSubmittedJobId(stdout: string): string {
  const match = /^\s*(\d+)(?:;\S*)?\s*$/.exec(stdout);
  if (!match) throw new Error(`sbatch --parsable printed no job id: ${JSON.stringify(stdout)}`);
  return match[1];
}

/** Submits `script` as a job array (one CPU per task) and returns the array's job id. */
export async function submitArray(cluster: SlurmCluster, script: string, options: SubmitArrayOptions): Promise<string> {
  const args = [
    '--parsable', `--array=${options.array}`, `--output=${options.output}`, `--chdir=${options.chdir}`,
    `--job-name=${options.jobName ?? 'arcsift-test'}`, `--time=${options.timeMinutes ?? 5}`,
    '--ntasks=1', '--cpus-per-task=1', script, ...(options.scriptArgs ?? []),
  ];
  return parseSubmittedJobId(await runSlurm(cluster, 'sbatch', args));
}

/** Records of `scontrol show job -o` output, one per line. */
export function parseJobRecords(text: string): SlurmJobRecord[] {
  const records: SlurmJobRecord[] = [];
  for (const line of text.split('\n')) {
    const field = (key: string): string | undefined => new RegExp(`(?:^|\\s)${key}=(\\S*)`).exec(line)?.[1];
    const jobId = field('JobId');
    if (jobId === undefined) continue;
    records.push({
      jobId,
      arrayJobId: field('ArrayJobId'),
      arrayTaskId: field('ArrayTaskId'),
      state: field('JobState') ?? 'UNKNOWN',
      reason: field('Reason') ?? '',
      exitCode: field('ExitCode') ?? '',
      stdOut: field('StdOut'),
    });
  }
  return records;
}

/** Every record of a job, or of each task of an array (`scontrol show job -o JOBID`). */
export async function showJob(cluster: SlurmCluster, jobId: string): Promise<SlurmJobRecord[]> {
  return parseJobRecords(await runSlurm(cluster, 'scontrol', ['show', 'job', '-o', jobId]));
}

/** States of a job's tasks still in the queue (pending, running, completing), keyed "JOBID_TASK" (squeue -r). */
export async function queuedTasks(cluster: SlurmCluster, jobId: string): Promise<Map<string, string>> {
  const out = await runSlurm(cluster, 'squeue', ['-h', '-r', '-j', jobId, '-o', '%i %T']);
  const tasks = new Map<string, string>();
  for (const line of out.split('\n')) {
    const [id, state] = line.trim().split(/\s+/);
    if (id && state) tasks.set(id, state);
  }
  return tasks;
}

/** Cancels one task of an array (`scancel JOBID_TASK`), or a whole job when taskId is omitted. */
export async function cancelTask(cluster: SlurmCluster, jobId: string, taskId?: number): Promise<void> {
  await runSlurm(cluster, 'scancel', [taskId === undefined ? jobId : `${jobId}_${taskId}`]);
}

/** Polls `scontrol show job` until the task has one of `states`; returns its record. */
export async function waitForTaskState(
  cluster: SlurmCluster, jobId: string, taskId: number, states: readonly string[], options: WaitOptions = {},
): Promise<SlurmJobRecord> {
  const { timeoutMs = 60_000, pollMs = 250 } = options;
  const deadline = Date.now() + timeoutMs;
  let last = 'no record';
  for (;;) {
    const record = (await showJob(cluster, jobId)).find((r) => r.arrayTaskId === String(taskId));
    if (record && states.includes(record.state)) return record;
    if (record) last = record.state;
    if (record && FINAL_JOB_STATES.has(record.state)) {
      throw new Error(`task ${jobId}_${taskId} ended ${record.state} (${record.reason}) before reaching ${states.join('/')}`);
    }
    if (Date.now() > deadline) throw new Error(`task ${jobId}_${taskId} not ${states.join('/')} after ${timeoutMs} ms (last: ${last})`);
    await sleep(pollMs);
  }
}

/**
 * Waits until no task of the array is queued (squeue) and every record of `scontrol show job`
 * is in a final state; returns the final record of each task by task id.
 */
export async function waitForArray(cluster: SlurmCluster, jobId: string, options: WaitOptions = {}): Promise<Map<number, SlurmJobRecord>> {
  const { timeoutMs = 60_000, pollMs = 250 } = options;
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const queued = await queuedTasks(cluster, jobId);
    if (queued.size === 0) {
      const records = await showJob(cluster, jobId);
      if (records.length > 0 && records.every((r) => FINAL_JOB_STATES.has(r.state) && /^\d+$/.test(r.arrayTaskId ?? ''))) {
        return new Map(records.map((r) => [Number(r.arrayTaskId), r]));
      }
    }
    if (Date.now() > deadline) {
      const left = [...queued].map(([id, state]) => `${id} ${state}`).join(', ');
      throw new Error(`job array ${jobId} not finished after ${timeoutMs} ms (still queued: ${left || 'none'})`);
    }
    await sleep(pollMs);
  }
}

function sleep(ms: number): Promise<void> {
  return new Promise((resolve) => setTimeout(resolve, ms));
}
