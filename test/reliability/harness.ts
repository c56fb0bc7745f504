import { spawn, spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import { fileURLToPath } from 'node:url';

/** The built command line (npm test builds it first). */
export const CLI = fileURLToPath(new URL('../../dist/src-main/cli/main.js', import.meta.url));
export const cliBuilt = existsSync(CLI);

export interface Run {
  code: number | null;
  signal: NodeJS.Signals | null;
  stdout: string;
  stderr: string;
}

/** How one attempt ended, as the suite counts it. */
export type Outcome = 'completed' | 'refused' | 'crashed' | 'lost';

export class Tally {
  readonly counts: Record<Outcome, number> = { completed: 0, refused: 0, crashed: 0, lost: 0 };
  readonly failures: string[] = [];
  add(outcome: Outcome, what: string): void {
    this.counts[outcome]++;
    if (outcome === 'crashed' || outcome === 'lost') this.failures.push(`${outcome}: ${what}`);
  }
  get tried(): number {
    return Object.values(this.counts).reduce((a, b) => a + b, 0);
  }
  line(name: string): string {
    const c = this.counts;
    return `${name}: tried ${this.tried}, completed ${c.completed}, refused cleanly ${c.refused}, crashed ${c.crashed}, lost ${c.lost}`;
  }
}

/** A stack trace or the catch-all's words: the command failed in a way it did not mean to. */
export function looksCrashed(run: Run): boolean {
  return /internal error|\n\s+at \S+ \(|SqliteError|RangeError|TypeError|heap out of memory/.test(run.stderr);
}

/** Runs the command line to its end (optionally as another user). */
export function holdfast(args: readonly string[], cwd: string, user?: string): Promise<Run> {
  const [cmd, argv] = user
    ? ['runuser', ['-u', user, '--', process.execPath, CLI, ...args]]
    : [process.execPath, [CLI, ...args]];
  return new Promise((resolve, reject) => {
    const child = spawn(cmd, argv, { cwd, stdio: ['ignore', 'pipe', 'pipe'] });
    let stdout = '';
    let stderr = '';
    child.stdout.on('data', (d) => (stdout += d));
    child.stderr.on('data', (d) => (stderr += d));
    child.on('error', reject);
    child.on('close', (code, signal) => resolve({ code, signal, stdout, stderr }));
  });
}

/** Runs the command line and SIGKILLs it after `ms` (if it is still running then). */
export function holdfastKilledAfter(
  args: readonly string[],
  cwd: string,
  ms: number,
): Promise<Run & { killed: boolean }> {
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, [CLI, ...args], { cwd, stdio: ['ignore', 'pipe', 'pipe'] });
    let stdout = '';
    let stderr = '';
    let killed = false;
    const timer = setTimeout(() => {
      if (child.exitCode === null) killed = child.kill('SIGKILL');
    }, ms);
    child.stdout.on('data', (d) => (stdout += d));
    child.stderr.on('data', (d) => (stderr += d));
    child.on('error', reject);
    child.on('close', (code, signal) => {
      clearTimeout(timer);
      resolve({ code, signal, stdout, stderr, killed: killed && signal === 'SIGKILL' });
    });
  });
}

/** Runs `jobs` with at most `width` at a time (the machine has two cores). */
export async function inParallel<T>(jobs: readonly (() => Promise<T>)[], width = 2): Promise<T[]> {
  const results: T[] = new Array(jobs.length);
  let next = 0;
  await Promise.all(
    Array.from({ length: width }, async () => {
      while (next < jobs.length) {
        const i = next++;
        results[i] = await jobs[i]();
      }
    }),
  );
  return results;
}

export const canSwitchUser =
  process.getuid?.() === 0 && spawnSync('runuser', ['-u', 'nobody', '--', 'true']).status === 0;
