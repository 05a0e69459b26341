#!/usr/bin/env node
// Run-for-run comparison of two sweeps, for changes that must not move a number (refactors,
// speed-ups). Everything a run records is compared except its wall time; the files' own dates,
// environment and (with --ignore-problem-hash) the problems' hashes are left out: their sha256,
// their definition text (which names the hashes of their sources) and the plan's fingerprint.
//
//   node scripts/same-runs.mjs capture <out.json> [stepgauge run flags...]
//       runs this checkout's CLI (build first) with --no-timing --json --no-report --jobs 2
//   node scripts/same-runs.mjs compare <before.json> <after.json> [--ignore-problem-hash] [--new-method <id>]...
//       runs matched by (problem, method, setting); exit 0 when identical, 1 with the differences
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { isDeepStrictEqual } from 'node:util';

const [mode, ...args] = process.argv.slice(2);

function capture(out, flags) {
  const cli = join(dirname(fileURLToPath(import.meta.url)), '..', 'bin', 'stepgauge.js');
  const dir = mkdtempSync(join(tmpdir(), 'stepgauge-same-runs-'));
  try {
    let text;
    try {
      text = execFileSync(process.execPath, [cli, 'run', '--no-timing', '--json', '--no-report', '-q', '--jobs', '2', '-o', join(dir, 'out'), ...flags], {
        encoding: 'utf8',
        maxBuffer: 1 << 30,
        stdio: ['ignore', 'pipe', 'inherit'],
      });
    } catch (e) {
      // Exit 3 means some runs failed, which a catalogue sweep expects; the results are complete.
      if (e.status !== 3) throw e;
      text = e.stdout;
    }
    writeFileSync(out, text);
    process.stdout.write(`captured ${JSON.parse(text).runs.length} runs in ${out}\n`);
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

const withoutTime = ({ time: _time, planIndex: _planIndex, ...rest }) => rest;
const runKey = (r) => `${r.problem} x ${r.method} ${JSON.stringify(r.setting)}`;

/** `newMethods`: ids added between the two sweeps; their runs, records and skips are left out. */
function compare(beforePath, afterPath, { ignoreProblemHash, newMethods }) {
  const before = JSON.parse(readFileSync(beforePath, 'utf8'));
  const after = JSON.parse(readFileSync(afterPath, 'utf8'));
  const kept = (list) => list.filter((x) => !newMethods.includes(x.method ?? x.id));
  const problems = (file) => file.problems.map((p) => (ignoreProblemHash ? { ...p, sha256: undefined, definition: undefined } : p));
  const differences = [];
  const afterRuns = new Map(kept(after.runs).map((r) => [runKey(r), r]));
  const beforeRuns = kept(before.runs);
  for (const run of beforeRuns) {
    const other = afterRuns.get(runKey(run));
    afterRuns.delete(runKey(run));
    if (!other) differences.push(`${runKey(run)}: missing after`);
    else if (!isDeepStrictEqual(withoutTime(run), withoutTime(other))) {
      const a = withoutTime(run);
      const b = withoutTime(other);
      differences.push(`${runKey(run)}: ${Object.keys({ ...a, ...b }).filter((k) => !isDeepStrictEqual(a[k], b[k])).join(', ')} differ`);
    }
  }
  for (const key of afterRuns.keys()) differences.push(`${key}: new after`);
  const parts = newMethods.length > 0 ? ['methods', 'skipped'] : ['methods', 'skipped', 'plan', 'request'];
  for (const part of parts) {
    const pick = (file) => {
      const value = Array.isArray(file[part]) ? kept(file[part]) : file[part];
      // The plan's fingerprint hashes the problems' definitions; its run count is still compared.
      return part === 'plan' && ignoreProblemHash && value ? { ...value, sha256: undefined } : value;
    };
    if (!isDeepStrictEqual(pick(before), pick(after))) differences.push(`"${part}" differs`);
  }
  if (!isDeepStrictEqual(problems(before), problems(after))) differences.push('"problems" differs');
  const leftOut = ['time', ...(ignoreProblemHash ? ['problem hashes'] : []), ...(newMethods.length ? [`the new ${newMethods.join(', ')}`] : [])];
  if (differences.length === 0) {
    process.stdout.write(`identical: ${beforeRuns.length} runs (everything but ${leftOut.join(', ')})\n`);
    return 0;
  }
  process.stdout.write(`${differences.length} difference(s):\n${differences.slice(0, 40).join('\n')}\n`);
  return 1;
}

function flagValues(list, name) {
  const out = [];
  for (let i = 0; i < list.length; i++) if (list[i] === name && list[i + 1]) out.push(list[++i]);
  return out;
}

if (mode === 'capture' && args[0]) capture(args[0], args.slice(1));
else if (mode === 'compare' && args[1]) process.exitCode = compare(args[0], args[1], { ignoreProblemHash: args.includes('--ignore-problem-hash'), newMethods: flagValues(args, '--new-method') });
else {
  process.stderr.write('usage: same-runs.mjs capture <out.json> [run flags] | compare <before.json> <after.json> [--ignore-problem-hash] [--new-method <id>]...\n');
  process.exitCode = 2;
}
