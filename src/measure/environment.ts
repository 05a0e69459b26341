// The environment fingerprint stored with every results file, so an auditor can tell where and
// with what a sweep ran.
//
// Asynchronous: git runs as a child process while the sweep runs (runSweep starts the fingerprint
// before its first run). Two git commands run one after the other at the end held the main
// process for about 50 ms after the last run, with a parallel sweep's cores idle.
import { execFile } from 'node:child_process';
import os from 'node:os';
import type { Environment } from '../results/contract.js';
import { packageVersion } from '../core/version.js';

/** A git command's standard output, or null when git or the repository is not there. */
function git(cwd: string, args: readonly string[]): Promise<string | null> {
  return new Promise((resolve) => {
    execFile('git', args, { cwd }, (error, stdout) => resolve(error ? null : String(stdout)));
  });
}

/**
 * The commit checked out and whether tracked files differ from it, from one `git status` (its
 * porcelain v2 header names the commit; every other line is a change): one process instead of two.
 */
async function gitCommit(cwd: string): Promise<{ commit?: string; dirty?: boolean }> {
  const status = await git(cwd, ['status', '--porcelain=v2', '--branch', '--untracked-files=no']);
  if (status === null) return {};
  const lines = status.split('\n').filter((l) => l.length > 0);
  const commit = /^# branch\.oid ([0-9a-f]{40,64})$/m.exec(status)?.[1];
  // A repository without commits says "(initial)": there is no commit to name.
  if (!commit) return {};
  return { commit, dirty: lines.some((l) => !l.startsWith('#')) };
}

export async function environmentFingerprint(cwd = process.cwd()): Promise<Environment> {
  const git = await gitCommit(cwd);
  const cpus = os.cpus();
  const env: Environment = {
    node: process.version,
    platform: `${os.platform()} ${os.release()}`,
    arch: os.arch(),
    cpu: cpus[0]?.model?.trim() ?? 'unknown',
    cpuCount: cpus.length,
    stepgauge: packageVersion(),
  };
  if (git.commit) {
    env.commit = git.commit;
    env.commitDirty = git.dirty ?? false;
  }
  return env;
}
