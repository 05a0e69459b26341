// The environment fingerprint stored with every results file, so an auditor can tell where and
// with what a sweep ran.
//
// Asynchronous: the two git commands run as child processes while the sweep runs (runSweep starts
// the fingerprint before its first run). Run one after the other at the end, they held the main
// process for about 50 ms after the last run, with a parallel sweep's cores idle.
import { execFile } from 'node:child_process';
import os from 'node:os';
import type { Environment } from '../core/results.js';
import { packageVersion } from '../core/version.js';

/** A git command's standard output, or null when git or the repository is not there. */
function git(cwd: string, args: readonly string[]): Promise<string | null> {
  return new Promise((resolve) => {
    execFile('git', args, { cwd }, (error, stdout) => resolve(error ? null : String(stdout)));
  });
}

async function gitCommit(cwd: string): Promise<{ commit?: string; dirty?: boolean }> {
  const [head, status] = await Promise.all([git(cwd, ['rev-parse', 'HEAD']), git(cwd, ['status', '--porcelain', '--untracked-files=no'])]);
  if (head === null || status === null) return {};
  return { commit: head.trim(), dirty: status.trim().length > 0 };
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
