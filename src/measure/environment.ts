// The environment fingerprint stored with every results file, so an auditor can tell where and
// with what a sweep ran.
import { execFileSync } from 'node:child_process';
import os from 'node:os';
import type { Environment } from '../core/results.js';
import { packageVersion } from '../core/version.js';

function gitCommit(cwd: string): { commit?: string; dirty?: boolean } {
  try {
    const commit = execFileSync('git', ['rev-parse', 'HEAD'], { cwd, stdio: ['ignore', 'pipe', 'ignore'] })
      .toString()
      .trim();
    const status = execFileSync('git', ['status', '--porcelain', '--untracked-files=no'], {
      cwd,
      stdio: ['ignore', 'pipe', 'ignore'],
    }).toString();
    return { commit, dirty: status.trim().length > 0 };
  } catch {
    return {};
  }
}

export function environmentFingerprint(cwd = process.cwd()): Environment {
  const cpus = os.cpus();
  const git = gitCommit(cwd);
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
