// The bad-input corpus (test/fixtures/bad/): every file is fed to `stepgauge run` in process. Each
// must end with exit 2 and one line on stderr that names the file (with line and column where the
// file has them) and the field, with no stack trace, and nothing may be written: the temporary
// folder that holds --out stays empty (no results, no half-written folder, no journal beside it).
// A few files in the corpus are valid on purpose (a byte-order mark, CRLF line endings): those
// must load and give the same problem as the plain file.
import { accessSync, chmodSync, constants, copyFileSync, existsSync, mkdirSync, mkdtempSync, readFileSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import fs from 'node:fs';
import fsp from 'node:fs/promises';
import { syncBuiltinESMExports } from 'node:module';
import { tmpdir } from 'node:os';
import { spawn, spawnSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { availableParallelism, hostname } from 'node:os';
import { join, resolve } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { parse as parseCsv } from 'csv-parse/sync';
import { CSV_COLUMNS } from '../src/results/csv.js';
import { readResultsFile } from '../src/results/read.js';
import { MAX_PROBLEM_FILE_BYTES } from '../src/problems/file/read-limited.js';
import { MAX_FILE_STATES } from '../src/problems/equations/names.js';
import { runCli, type CliResult } from './helpers/cli.js';
import { loadProblemFile } from '../src/problems/load-file.js';

const BAD = 'test/fixtures/bad';
const scratch: string[] = [];
afterAll(() => {
  for (const d of scratch) rmSync(d, { recursive: true, force: true });
});

function freshDir(): string {
  const d = mkdtempSync(join(tmpdir(), 'sg-bad-input-'));
  scratch.push(d);
  return d;
}

/** Runs `run` on one problem (and optionally a method) with a fast fixed-step setting. */
async function runOn(problem: string, method = 'rk4'): Promise<{ r: CliResult; dir: string }> {
  const dir = freshDir();
  const r = await runCli(['run', '--problem', problem, '-m', method, '-s', '10', '--no-timing', '-q', '--out', join(dir, 'out')]);
  return { r, dir };
}

/** The assertions every refused input shares. */
function expectRefused(r: CliResult, dir: string | undefined, where: string, says: RegExp): void {
  expect(r.code, r.stderr).toBe(2);
  const lines = r.stderr.split('\n').filter((l) => l !== '');
  expect(lines, r.stderr).toHaveLength(1);
  const line = lines[0]!;
  expect(line.startsWith('stepgauge: ')).toBe(true);
  expect(line).toContain(where);
  expect(line).toMatch(says);
  expect(r.stderr).not.toMatch(/^\s+at /m);
  expect(r.stderr).not.toContain('internal error');
  if (dir !== undefined) expect(readdirSync(dir)).toEqual([]);
}

// [fixture, text that must be in the message (file, line and column), what it must say (field and reason)]
// Lines and columns were read off the fixture files by hand.
const PROBLEM_FILES: readonly (readonly [string, string, RegExp])[] = [
  // malformed YAML and JSON
  ['yaml-unclosed-flow.yaml', 'yaml-unclosed-flow.yaml:4:1', /YAML syntax error: Flow sequence in block collection must be sufficiently indented and end with a \]$/],
  ['yaml-bad-indent.yaml', 'yaml-bad-indent.yaml:5:6', /YAML syntax error: Nested mappings are not allowed/],
  ['yaml-tab-indent.yaml', 'yaml-tab-indent.yaml:5:1', /YAML syntax error: Tabs are not allowed as indentation$/],
  ['yaml-duplicate-key.yaml', 'yaml-duplicate-key.yaml:8:3', /YAML syntax error: Map keys must be unique$/],
  ['yaml-deep-nesting.yaml', 'yaml-deep-nesting.yaml', /nest|stack/i],
  ['json-missing-comma.json', 'json-missing-comma.json:4:3', /JSON syntax error: Expected ',' or '\}' after property value/],
  ['json-trailing-comma.json', 'json-trailing-comma.json:5:1', /JSON syntax error: Expected double-quoted property name/],
  ['json-truncated.json', 'json-truncated.json:4:17', /JSON syntax error/],
  ['json-duplicate-key.json', 'json-duplicate-key.json:1:19', /a key appears twice in the same object/],
  ['json-deep-nesting.json', 'json-deep-nesting.json', /nested too deeply to be read/],
  ['empty.yaml', 'empty.yaml', /\(top level\): a problem file must hold a mapping of fields/],
  ['scalar-top.yaml', 'scalar-top.yaml:1:1', /\(top level\): a problem file must hold a mapping/],
  ['list-top.json', 'list-top.json:1:1', /\(top level\): a problem file must hold a mapping/],
  ['binary-garbage.yaml', 'binary-garbage.yaml', /a problem file must hold a mapping|syntax error/],
  ['notes.txt', `--problem ${BAD}/notes.txt`, /unknown problem file type '\.txt'; expected \.yaml, \.yml, \.json, \.ts or \.js/],
  // wrong types and shapes
  ['states-not-list.yaml', 'states-not-list.yaml:3:9', /states: Invalid input: expected array, received string/],
  ['span-three-values.yaml', 'span-three-values.yaml:9:7', /span: Too big: expected array to have <=2 items/],
  ['span-text.yaml', 'span-text.yaml:9:7', /span: Invalid input: expected tuple, received string/],
  ['stiff-text.yaml', 'stiff-text.yaml:10:8', /stiff: Invalid input: expected boolean, received string/],
  ['id-not-kebab.yaml', 'id-not-kebab.yaml:1:5', /id: must be kebab-case/],
  ['title-empty.yaml', 'title-empty.yaml:2:8', /title: Too small/],
  ['equation-boolean.yaml', 'equation-boolean.yaml:6:6', /equations\.x: has none of the accepted forms/],
  ['unknown-field.yaml', 'unknown-field.yaml:1:1', /\(top level\): Unrecognized key: "equashuns"/],
  ['missing-equations.yaml', 'missing-equations.yaml:1:1', /equations: is required \(expected record\)/],
  ['long-line-garbage.yaml', 'long-line-garbage.yaml:9:7', /span: Too big: expected array to have <=2 items/],
  // unknown symbols, names, cycles
  ['unknown-symbol.yaml', 'unknown-symbol.yaml:7:6', /equations\.v: unknown symbol 'kk' \(known here: t, x, v, k, pi, e\)/],
  ['unknown-function.yaml', 'unknown-function.yaml:7:6', /equations\.v: function 'foo' is not allowed/],
  ['reserved-name.yaml', 'reserved-name.yaml:3:10', /states\[0\]: state name 't' is reserved/],
  ['name-used-twice.yaml', 'name-used-twice.yaml:4:24', /parameters\.x: parameter name 'x' is already used as a state/],
  ['definition-cycle.yaml', 'definition-cycle.yaml:6:6', /definitions\.a: definitions form a cycle: a -> b -> c -> a/],
  ['parameter-self.yaml', 'parameter-self.yaml:4:18', /parameters\.k: parameter 'k' uses itself/],
  ['parameter-forward.yaml', 'parameter-forward.yaml:4:18', /parameters\.k: parameter 'k' uses 'm', which is defined after it/],
  ['equation-not-a-state.yaml', 'equation-not-a-state.yaml:8:6', /equations\.w: 'w' is not a state \(states: x, v\)/],
  ['initial-missing.yaml', 'initial-missing.yaml:8:10', /initial: state 'v' has no initial value/],
  ['invariant-unknown-symbol.yaml', 'invariant-unknown-symbol.yaml:10:23', /invariants\.energy: unknown symbol 'y'/],
  ['measure-outputs-without-outputs.yaml', 'measure-outputs-without-outputs.yaml:10:19', /error\.measure: measure: outputs needs an `outputs` section/],
  ['relative-without-floor.yaml', 'relative-without-floor.yaml:10:8', /error: scale: relative needs a floor/],
  ['separable-unknown-state.yaml', 'separable-unknown-state.yaml:10:43', /separable\.velocities\[0\]: 'w' is not a state/],
  ['reference-time-outside.yaml', 'reference-time-outside.yaml:11:13', /reference\.at\[0\]\.t: time 20 is outside the span \(0, 10\]/],
  ['reference-exact-missing-state.yaml', 'reference-exact-missing-state.yaml:11:10', /reference\.exact: state 'v' has no exact expression/],
  // spans and times
  ['span-empty.yaml', 'span-empty.yaml:9:7', /span: span \[1, 1\] is empty; the end must be later than the start/],
  ['span-reversed.yaml', 'span-reversed.yaml:9:7', /span: span \[10, 0\] is reversed/],
  ['checktime-outside.yaml', 'checktime-outside.yaml:10:17', /checkTimes\[1\]: check time 12 is outside the span \(0, 10\]/],
  // NaN, Infinity and numbers past the double range
  ['initial-nan.yaml', 'initial-nan.yaml:8:15', /initial\.x: must be a finite number, got NaN$/],
  ['span-infinity.yaml', 'span-infinity.yaml:9:11', /span\[1\]: must be a finite number, got Infinity$/],
  ['initial-huge-exponent.yaml', 'initial-huge-exponent.yaml:8:15', /initial\.x: must be a finite number, got Infinity$/],
  ['json-huge-exponent.json', 'json-huge-exponent.json:6:21', /initial\.x: must be a finite number, got Infinity$/],
  ['parameter-division-by-zero.yaml', 'parameter-division-by-zero.yaml:4:18', /parameters\.k: `1 \/ 0` evaluates to Infinity; a finite number is needed/],
  ['parameter-overflow.yaml', 'parameter-overflow.yaml:4:18', /parameters\.k: `10\^400` evaluates to Infinity/],
  ['span-nan-expression.yaml', 'span-nan-expression.yaml:9:11', /span\[1\]: `0 \/ 0` evaluates to NaN/],
  // linear state-space models: shapes (A n x n, B n x m, C p x n, D p x m)
  ['linear-A-not-square.yaml', 'linear-A-not-square.yaml:5:6', /linear\.A: must be square \(n x n, n = number of states\); got 2 x 3/],
  ['linear-A-ragged-rows.yaml', 'linear-A-ragged-rows.yaml:5:15', /linear\.A\[1\]: row 2 has 1 entries, row 1 has 2/],
  ['linear-B-shape.yaml', 'linear-B-shape.yaml:6:6', /linear\.B: must be 2 x 1 \(n x m: n = 2 states from A, m = 1 inputs\); got 2 x 2/],
  ['linear-B-without-inputs.yaml', 'linear-B-without-inputs.yaml:1:1', /inputs: B has 1 column\(s\), one per input, but no inputs are given/],
  ['linear-inputs-without-B.yaml', 'linear-inputs-without-B.yaml:5:3', /linear: 1 input\(s\) given but no B matrix \(n x m = 2 x 1\)/],
  ['linear-C-columns.yaml', 'linear-C-columns.yaml:6:6', /linear\.C: must have 2 columns \(p x n, n = 2 states\); got 1 x 3/],
  ['linear-D-without-C.yaml', 'linear-D-without-C.yaml:6:6', /linear\.D: D needs a C matrix/],
  ['linear-D-shape.yaml', 'linear-D-shape.yaml:8:6', /linear\.D: must be 1 x 1 \(p x m: p = 1 outputs from C, m = 1 inputs\); got 1 x 2/],
  ['linear-initial-length.yaml', 'linear-initial-length.yaml:6:10', /initial: has 3 values; the model has 2 states \(q, p\)/],
  ['linear-states-count.yaml', 'linear-states-count.yaml:3:9', /states: lists 3 states but A is 2 x 2/],
  ['linear-A-unknown-symbol.yaml', 'linear-A-unknown-symbol.yaml:5:20', /linear\.A\[1\]\[1\]: unknown symbol 'omega'/],
  ['linear-A-nan.yaml', 'linear-A-nan.yaml:5:20', /linear\.A\[1\]\[1\]: must be a finite number, got NaN$/],
  ['linear-and-equations.yaml', 'linear-and-equations.yaml:4:12', /equations: a file describes either `equations` or a `linear` model, not both/],
  // CSV matrices: the message names the CSV file (where the fault is) and the matrix field
  ['linear-csv-nonnumeric.yaml', resolve(BAD, 'cells-nonnumeric.csv'), /row 2, column 2: 'zero' is not a number \(matrix linear\.A\)$/],
  ['linear-csv-nan.yaml', resolve(BAD, 'cells-nan.csv'), /row 2, column 2: 'NaN' is not a number \(matrix linear\.A\)$/],
  ['linear-csv-huge-exponent.yaml', resolve(BAD, 'cells-huge.csv'), /row 2, column 2: '1e999' is too large for a double \(it reads as Infinity\) \(matrix linear\.A\)$/],
  ['linear-csv-ragged.yaml', resolve(BAD, 'cells-ragged.csv'), /row 2 has 1 cells, row 1 has 2 \(ragged matrix for linear\.A\)$/],
  ['linear-csv-bad-quote.yaml', resolve(BAD, 'cells-bad-quote.csv'), /CSV syntax error for linear\.A: Quote Not Closed/],
  ['linear-csv-missing.yaml', 'linear-csv-missing.yaml:5:6', /linear\.A: cannot read matrix file no-such-matrix\.csv \(ENOENT\)$/],
  ['linear-csv-directory.yaml', 'linear-csv-directory.yaml:5:6', /linear\.A: cannot read matrix file a-folder\.csv \(a folder, not a regular file\)$/],
  ['linear-csv-empty.yaml', 'linear-csv-empty.yaml:5:6', /linear\.A: matrix has no rows$/],
  // folders and missing files where a problem file is expected
  ['folder-problem.yaml', `--problem ${BAD}/folder-problem.yaml`, /expected a file, found a folder$/],
  ['no-such-problem.yaml', `--problem ${BAD}/no-such-problem.yaml`, /file not found$/],
  // hostile and oversized expressions
  ['hostile-import.yaml', 'hostile-import.yaml:7:6', /equations\.v: function 'import' is not allowed/],
  ['hostile-evaluate.yaml', 'hostile-evaluate.yaml:7:6', /equations\.v: function 'evaluate' is not allowed/],
  ['hostile-constructor.yaml', 'hostile-constructor.yaml:7:6', /equations\.v: calling `sin\.constructor` is not allowed/],
  ['hostile-proto.yaml', 'hostile-proto.yaml:7:6', /equations\.v: property access or indexing `x\["__proto__"\]` is not allowed$/],
  ['hostile-parameter.yaml', 'hostile-parameter.yaml:4:18', /parameters\.k: function 'createUnit' is not allowed/],
  ['hostile-alias-bomb.yaml', 'hostile-alias-bomb.yaml', /YAML cannot be expanded: Excessive alias count/],
  ['yaml-unknown-tag.yaml', 'yaml-unknown-tag.yaml:7:20', /equations\.v: cannot parse `function \(\) \{ return process \}`/],
  ['long-expression.yaml', 'long-expression.yaml:7:6', /equations\.v: expression is longer than 10000 characters$/],
  ['deep-nesting.yaml', 'deep-nesting.yaml:7:6', /equations\.v: `\({57}\.\.\.` is nested too deeply to parse; split it into definitions$/],
  // problem and method modules
  ['module-syntax-error.ts', 'module-syntax-error.ts:12:3', /cannot build module: Unexpected ","/],
  ['module-throws-on-import.ts', `${BAD}/module-throws-on-import.ts`, /module failed while loading: calibration table is empty$/],
  ['module-nan-at-start.ts', `${BAD}/module-nan-at-start.ts`, /defineProblem\(nan-at-start\): f\(t0, y0\) gave a non-finite derivative for component 0$/],
  ['module-exports-nothing.ts', `${BAD}/module-exports-nothing.ts`, /exports neither a problem nor a method/],
];

// Issue 22, model files: paths a problem file refers to, prototype names. [fixture, where, says]
const MODEL_FILES: readonly (readonly [string, string, RegExp])[] = [
  ['linear-csv-outside.yaml', 'linear-csv-outside.yaml:6:6', /linear\.A: cannot read matrix file \.\.\/\.\.\/\.\.\/package\.json \(outside the problem file's folder \(after resolving links\)/],
  ['linear-csv-absolute.yaml', 'linear-csv-absolute.yaml:6:6', /linear\.A: cannot read matrix file \/dev\/zero \(an absolute path; give a path relative to the problem file/],
  ['linear-csv-symlink-outside.yaml', 'linear-csv-symlink-outside.yaml:6:6', /linear\.A: cannot read matrix file cells-link-outside\.csv \(outside the problem file's folder/],
  ['proto-parameter.yaml', 'proto-parameter.yaml:5:26', /parameters\.__proto__: '__proto__' cannot be used as a name or key \(it is special to JavaScript objects\)$/],
  ['proto-invariant.yaml', 'proto-invariant.yaml:11:16', /invariants\.constructor: 'constructor' cannot be used as a name or key/],
  ['proto-state.yaml', 'proto-state.yaml:7:14', /equations\.prototype: 'prototype' cannot be used as a name or key/],
  ['proto-json-key.json', 'proto-json-key.json:5:56', /equations\.__proto__: '__proto__' cannot be used as a name or key/],
];

// Issue 22, results validated before they are written: [fixture, method, what the run records].
const RECORDED_FILES: readonly (readonly [string, string, string, RegExp])[] = [
  ['module-method-returns-nan.ts', 'robertson', 'diverged', /^returns-nan reported ok, but its final state is not finite \(y\[0\] = NaN at t = 100000000000\)$/],
  ['module-method-returns-status.ts', 'robertson', 'error', /^returns-status returned status "finished", which is not one of ok, diverged, step-underflow, step-limit, timeout, error$/],
  ['module-method-returns-counts.ts', 'robertson', 'error', /^returns-counts returned impossible counts \(nfev -3, rejected 1\.5\); every count is a whole number, 0 or more$/],
  ['linear-exact-overflow.yaml', 'rk4', 'error', /^the reference is not finite at t = 1 \(component \[0\] = Infinity\); error not measured$/],
];

describe('bad problem files: exit 2, one line naming file and field, nothing written', () => {
  it('the corpus holds at least 40 bad files', () => {
    expect(PROBLEM_FILES.length).toBeGreaterThanOrEqual(40);
    // Every fixture named in the table exists, and the table names every problem-like fixture.
    const onDisk = new Set(readdirSync(BAD));
    const named = new Set([...PROBLEM_FILES, ...MODEL_FILES, ...RECORDED_FILES].map(([f]) => f));
    for (const f of named) if (f !== 'no-such-problem.yaml') expect(onDisk.has(f), f).toBe(true);
    const helpers = /^(cells-.*\.csv|a-folder\.csv|valid-.*|linear-valid-.*|results-.*\.json|module-method-.*)$/;
    for (const f of onDisk) if (!helpers.test(f)) expect(named.has(f), `${f} is not in the table`).toBe(true);
  });

  it.each(PROBLEM_FILES)('%s', async (fixture, where, says) => {
    const { r, dir } = await runOn(join(BAD, fixture));
    expectRefused(r, dir, where, says);
  });

  it('a method module with an unknown family: --method names the module', async () => {
    const { r, dir } = await runOn('harmonic-oscillator', join(BAD, 'module-method-bad-family.ts'));
    expectRefused(r, dir, join(BAD, 'module-method-bad-family.ts'), /defineMethod\(magic-step\): family must be one of fixed-step, embedded-explicit/);
  });

  // chmod 000 does not stop root from reading, and these tests may run as root: then the case
  // cannot be produced and is skipped (the loader's EACCES branch is the same as ENOENT's).
  const lockedDir = freshDir();
  const locked = join(lockedDir, 'locked.yaml');
  writeFileSync(locked, 'id: locked\ntitle: Locked\nstates: [x]\nequations: { x: -x }\ninitial: { x: 1 }\nspan: [0, 1]\n');
  chmodSync(locked, 0o000);
  let readable = true;
  try {
    accessSync(locked, constants.R_OK);
  } catch {
    readable = false;
  }
  it.skipIf(readable)('an unreadable problem file (chmod 000): cannot read, EACCES', async () => {
    const { r, dir } = await runOn(locked);
    expectRefused(r, dir, locked, /cannot read problem file: EACCES$/);
  });
});

describe('valid on purpose: a byte-order mark and CRLF line endings load like the plain file', () => {
  it.each(['valid-bom.yaml', 'valid-crlf.yaml', 'valid-bom-crlf.json'])('%s gives the same equations, span and start', async (fixture) => {
    const p = await loadProblemFile(join(BAD, fixture));
    expect(p.stateNames).toEqual(['x', 'v']);
    expect([p.t0, p.tEnd]).toEqual([0, 10]);
    expect(p.y0).toEqual([1, 0]);
    const dy = new Float64Array(2);
    p.f(0, Float64Array.of(0.5, -2), dy);
    // x' = v, v' = -k x with k = 4: (-2, -2) at (0.5, -2), by hand.
    expect(Array.from(dy)).toEqual([-2, -2]);
  });
  it('a CSV matrix with a byte-order mark and CRLF rows reads as plain numbers', async () => {
    const p = await loadProblemFile(join(BAD, 'linear-valid-crlf-bom-csv.yaml'));
    const dy = new Float64Array(2);
    p.f(0, Float64Array.of(3, 5), dy);
    // A = [[0, 1], [-1, 0]]: (p, -q) = (5, -3).
    expect(Array.from(dy)).toEqual([5, -3]);
  });
  it('the BOM + CRLF JSON file runs through the CLI (exit 0, results written)', async () => {
    const dir = freshDir();
    const r = await runCli(['run', '--problem', join(BAD, 'valid-bom-crlf.json'), '-m', 'rk4', '-s', '10', '--no-timing', '-q', '--no-report', '--out', join(dir, 'out')]);
    expect(r.code, r.stderr).toBe(0);
    expect(r.stderr).toBe('');
    expect(readdirSync(join(dir, 'out')).sort()).toEqual(['.stepgauge-output', 'results.csv', 'results.json']);
  });
});

describe('bad flags and files for the other commands', () => {
  it('report on a missing results file', async () => {
    const dir = freshDir();
    const path = join(dir, 'nope', 'results.json');
    const r = await runCli(['report', path, '--out', join(dir, 'rep')]);
    expectRefused(r, dir, path, /cannot read results file \(ENOENT\)$/);
  });
  it('report on a truncated results file', async () => {
    const dir = freshDir();
    const r = await runCli(['report', join(BAD, 'results-truncated.json'), '--out', join(dir, 'rep')]);
    expectRefused(r, dir, join(BAD, 'results-truncated.json'), /not valid JSON \(.*\); expected stepgauge-results version 1$/);
  });
  it('report on a results file of a future version', async () => {
    const dir = freshDir();
    const r = await runCli(['report', join(BAD, 'results-future-version.json'), '--out', join(dir, 'rep')]);
    expectRefused(r, dir, join(BAD, 'results-future-version.json'), /version/);
    expect(r.stderr).toContain('7');
  });
  it('report on a results file with an unknown run status names the field', async () => {
    const dir = freshDir();
    const r = await runCli(['report', join(BAD, 'results-bad-status.json'), '--out', join(dir, 'rep')]);
    expectRefused(r, dir, join(BAD, 'results-bad-status.json'), /runs\[1\]\.status/);
    expect(r.stderr).toContain('exploded');
  });
  it('check with a baseline that is a folder (unreadable as a file)', async () => {
    const dir = freshDir();
    const r = await runCli(['check', 'test/fixtures/results-synthetic.json', '--baseline', dir, '--junit', join(dir, 'junit.xml')]);
    expectRefused(r, dir, dir, /cannot read baseline file \(EISDIR\)$/);
  });
  it('check with a missing baseline', async () => {
    const dir = freshDir();
    const r = await runCli(['check', 'test/fixtures/results-synthetic.json', '--baseline', join(dir, 'baseline.json')]);
    expectRefused(r, dir, join(dir, 'baseline.json'), /cannot read baseline file \(ENOENT\)$/);
  });
  it('check with a baseline that is a problem file, not a baseline', async () => {
    const r = await runCli(['check', 'test/fixtures/results-synthetic.json', '--baseline', join(BAD, 'json-huge-exponent.json')]);
    expectRefused(r, undefined, join(BAD, 'json-huge-exponent.json'), /field "format" is undefined; --baseline reads/);
  });
  it('merge where one file is not a results file: nothing is written', async () => {
    const dir = freshDir();
    const r = await runCli(['merge', 'test/fixtures/results-synthetic.json', join(BAD, 'list-top.json'), '--out', join(dir, 'merged.json')]);
    expectRefused(r, dir, join(BAD, 'list-top.json'), /object|format/);
  });
  it('choose without --target: exit 2, the flag named, no stack', async () => {
    const r = await runCli(['choose', '--problem', 'harmonic-oscillator']);
    expect(r.code).toBe(2);
    const lines = r.stderr.split('\n').filter((l) => l !== '');
    // commander's message, then the usage hint the CLI asks it to show after an error.
    expect(lines[0]).toBe("error: required option '--target <error>' not specified");
    expect(lines.slice(1)).toEqual(['(run with --help for usage)']);
    expect(r.stdout).toBe('');
  });
  it('choose with a target that is not a number names --target', async () => {
    const r = await runCli(['choose', '--problem', 'harmonic-oscillator', '--target', 'tiny']);
    expectRefused(r, undefined, '--target', /tiny/);
  });
});

// Issue 22, the output side: what stepgauge may replace, I/O failures, locks, resume, flags.
describe('outputs: stepgauge replaces only what it wrote itself', () => {
  const fast = ['-p', 'harmonic-oscillator', '-m', 'rk4', '-s', '10', '--no-timing', '-q', '--no-report'];
  /** A folder of the user's own: two files and a subfolder, none of them stepgauge's. */
  function userFolder(): { dir: string; thesis: string; listing: string[] } {
    const dir = freshDir();
    const thesis = join(dir, 'thesis');
    mkdirSync(join(thesis, '.git'), { recursive: true });
    writeFileSync(join(thesis, 'chapter1.tex'), '\\chapter{One}\n');
    writeFileSync(join(thesis, '.git', 'HEAD'), 'ref: refs/heads/main\n');
    return { dir, thesis, listing: readdirSync(thesis).sort() };
  }
  function expectUntouched(u: { thesis: string; listing: string[] }): void {
    expect(readdirSync(u.thesis).sort()).toEqual(u.listing);
    expect(readFileSync(join(u.thesis, 'chapter1.tex'), 'utf8')).toBe('\\chapter{One}\n');
    expect(readFileSync(join(u.thesis, '.git', 'HEAD'), 'utf8')).toBe('ref: refs/heads/main\n');
  }

  it('run -o on a folder with unrelated files: refused, the files still there, nothing beside it', async () => {
    const u = userFolder();
    const r = await runCli(['run', ...fast, '--out', u.thesis]);
    expectRefused(r, undefined, `--out ${u.thesis}`, /is a folder stepgauge did not write .*it is left untouched/);
    expectUntouched(u);
    expect(readdirSync(u.dir)).toEqual(['thesis']); // no journal, lock or temporary beside it
  });
  it('run -o with an empty name is refused', async () => {
    const r = await runCli(['run', ...fast, '--out', '']);
    expectRefused(r, undefined, '--out', /an empty folder name/);
  });
  it('run -o . (the current folder, here the repository itself) is refused', async () => {
    const r = await runCli(['run', ...fast, '--out', '.']);
    expectRefused(r, undefined, '--out .', /is the current folder or contains it/);
    expect(existsSync('.git')).toBe(true);
    expect(existsSync('package.json')).toBe(true);
  });
  it('run -o on a parent of the current folder is refused', async () => {
    const r = await runCli(['run', ...fast, '--out', '..']);
    expectRefused(r, undefined, '--out ..', /is the current folder or contains it/);
  });
  it('run -o on a file is refused', async () => {
    const u = userFolder();
    const r = await runCli(['run', ...fast, '--out', join(u.thesis, 'chapter1.tex')]);
    expectRefused(r, undefined, 'chapter1.tex', /exists and is not a folder/);
    expectUntouched(u);
  });
  it('an empty folder and a folder stepgauge wrote are written (twice: the second replaces the first)', async () => {
    const dir = freshDir();
    const out = join(dir, 'out');
    mkdirSync(out);
    for (let i = 0; i < 2; i++) {
      const r = await runCli(['run', ...fast, '--out', out]);
      expect(r.code, r.stderr).toBe(0);
      expect(readdirSync(out).sort()).toEqual(['.stepgauge-output', 'results.csv', 'results.json']);
    }
    // A folder holding a stepgauge results.json but no marker (an older stepgauge wrote it) is stepgauge's too.
    rmSync(join(out, '.stepgauge-output'));
    const again = await runCli(['run', ...fast, '--out', out]);
    expect(again.code, again.stderr).toBe(0);
  });
  it('report -o on a user folder is refused; its default folder (the results file\'s own) is written', async () => {
    const u = userFolder();
    const runDir = join(u.dir, 'sweep');
    expect((await runCli(['run', ...fast, '--out', runDir])).code).toBe(0);
    const r = await runCli(['report', join(runDir, 'results.json'), '--out', u.thesis]);
    expectRefused(r, undefined, `--out ${u.thesis}`, /is a folder stepgauge did not write/);
    expectUntouched(u);
    // A stepgauge results file copied into the user's folder under another name does not make it stepgauge's.
    copyFileSync(join(runDir, 'results.json'), join(u.thesis, 'merged.json'));
    const beside = await runCli(['report', join(u.thesis, 'merged.json')]);
    expectRefused(beside, undefined, `report folder (the results file's own) ${u.thesis}`, /is a folder stepgauge did not write/);
    expectUntouched({ thesis: u.thesis, listing: [...u.listing, 'merged.json'].sort() });
    const own = await runCli(['report', join(runDir, 'results.json')]);
    expect(own.code, own.stderr).toBe(0);
    expect(existsSync(join(runDir, 'report.html'))).toBe(true);
  });
  it.each([
    ['merge', (res: string, out: string) => ['merge', res, '--out', out], '--out'],
    ['baseline', (res: string, out: string) => ['baseline', res, '--out', out], '--out'],
    ['check --junit', (res: string, out: string) => ['check', res, '--baseline', res, '--junit', out], '--junit'],
  ] as const)('%s onto a file stepgauge did not write is refused; onto a folder too', async (_name, argv, flag) => {
    const u = userFolder();
    const runDir = join(u.dir, 'sweep');
    expect((await runCli(['run', ...fast, '--out', runDir])).code).toBe(0);
    const res = join(runDir, 'results.json');
    const target = join(u.thesis, 'chapter1.tex');
    expectRefused(await runCli(argv(res, target)), undefined, `${flag} ${target}`, /exists and is not a file stepgauge wrote; it is left untouched/);
    expectRefused(await runCli(argv(res, u.thesis)), undefined, `${flag} ${u.thesis}`, /is a folder; give a file name/);
    expectUntouched(u);
    // Its own earlier output is replaced.
    const own = join(u.dir, 'own.out');
    expect((await runCli(argv(res, own))).code).toBe(0);
    expect((await runCli(argv(res, own))).code).toBe(0);
  });
});

describe('exit codes: I/O failures are 74 naming the path, a path of the wrong kind is 2, user exits fail their run', () => {
  const fast = ['-p', 'harmonic-oscillator', '-m', 'rk4', '-s', '10', '--no-timing', '-q', '--no-report'];
  /** Makes `fn` of node:fs (or node:fs/promises) fail with a system error while `body` runs. */
  async function withFailing<T>(mod: Record<string, unknown>, fn: string, code: string, body: () => Promise<T>): Promise<T> {
    const original = mod[fn];
    mod[fn] = () => {
      throw Object.assign(new Error(`${code}: simulated`), { code, errno: -28, syscall: 'write' });
    };
    syncBuiltinESMExports();
    try {
      return await body();
    } finally {
      mod[fn] = original;
      syncBuiltinESMExports();
    }
  }
  it.each(['ENOSPC', 'EACCES', 'EROFS'])('run with the disk refusing results.json (%s): exit 74, one line naming --out, nothing written', async (code) => {
    const dir = freshDir();
    const out = join(dir, 'out');
    const r = await withFailing(fsp as unknown as Record<string, unknown>, 'writeFile', code, () => runCli(['run', ...fast, '--out', out]));
    expect(r.code, r.stderr).toBe(74);
    const lines = r.stderr.split('\n').filter(Boolean);
    expect(lines).toEqual([`stepgauge: --out ${out}: cannot write: ${code === 'ENOSPC' ? 'no space left on the device' : code === 'EACCES' ? 'permission denied' : 'read-only file system'} (${code})`]);
    // Nothing half-written: no folder, no temporary; the journal keeps the finished run for --resume.
    expect(readdirSync(dir)).toEqual(['.out.journal.jsonl']);
  });
  it('merge, baseline and check --junit with the disk full: exit 74 naming the file, no temporary left', async () => {
    const dir = freshDir();
    const res = 'test/fixtures/results-synthetic.json';
    for (const [argv, file] of [
      [['merge', res, '--out', join(dir, 'merged.json')], join(dir, 'merged.json')],
      [['check', res, '--baseline', res, '--junit', join(dir, 'junit.xml')], join(dir, 'junit.xml')],
    ] as const) {
      const r = await withFailing(fs as unknown as Record<string, unknown>, 'writeSync', 'ENOSPC', () => runCli([...argv]));
      expect(r.code, r.stderr).toBe(74);
      expect(r.stderr.split('\n').filter(Boolean).at(-1)).toBe(`stepgauge: ${file}: cannot write: no space left on the device (ENOSPC)`);
      expect(readdirSync(dir)).toEqual([]);
    }
  });
  it('report with the disk full: exit 74 naming --out, no report file or temporary left', async () => {
    const dir = freshDir();
    const out = join(dir, 'rep');
    const r = await withFailing(fsp as unknown as Record<string, unknown>, 'writeFile', 'ENOSPC', () => runCli(['report', 'test/fixtures/results-synthetic.json', '--out', out]));
    expect(r.code, r.stderr).toBe(74);
    expect(r.stderr.split('\n').filter(Boolean)).toEqual([`stepgauge: --out ${out}: cannot write: no space left on the device (ENOSPC)`]);
    expect(readdirSync(dir).flatMap((d) => [d, ...readdirSync(join(dir, d))])).toEqual(['rep']);
  });
  it('a hand-edited journal asking for a run timeout past a day is refused by --resume, the field named', async () => {
    const dir = freshDir();
    const header = { kind: 'stepgauge-journal', version: 1, planSha256: '0'.repeat(64), request: { problem: 'harmonic-oscillator', runTimeoutSeconds: 3e6, inputs: { stepgauge: '0', files: {} } } };
    writeFileSync(join(dir, '.out.journal.jsonl'), `${JSON.stringify(header)}\n`);
    const r = await runCli(['run', '--resume', join(dir, 'out'), '-q']);
    expectRefused(r, undefined, 'request.runTimeoutSeconds', /is 3000000, expected at most 86400 \(a day\)/);
  });
  it('merge --out under a file (ENOTDIR) is bad input: exit 2 naming the path', async () => {
    const dir = freshDir();
    writeFileSync(join(dir, 'plain'), '');
    const target = join(dir, 'plain', 'merged.json');
    const r = await runCli(['merge', 'test/fixtures/results-synthetic.json', '--out', target]);
    expectRefused(r, undefined, target, /a part of the path is a file, where a folder was expected \((ENOTDIR|EEXIST)\)$/);
  });
  it('run -p robertson --jobs 1 with a method that calls process.exit(0): the run is recorded as error, exit 0 (failed runs are results), results written', async () => {
    const dir = freshDir();
    const out = join(dir, 'out');
    const r = await runCli(['run', '-p', 'robertson', '--jobs', '1', '-m', 'test/fixtures/exits/exit-zero-method.ts', '-s', '10', '--no-timing', '-q', '--no-report', '--out', out]);
    expect(r.code, r.stderr).toBe(0);
    const results = JSON.parse(readFileSync(join(out, 'results.json'), 'utf8')) as { runs: { status: string; message: string }[] };
    expect(results.runs).toHaveLength(1);
    expect(results.runs[0]!.status).toBe('error');
    expect(results.runs[0]!.message).toBe('exit-zero-method threw: user code called process.exit(0); stepgauge did not exit (a module must return or throw, not end the process)');
  });
  it('a method module that calls process.exit(0) while loading: exit 2 naming the module', async () => {
    const { r, dir } = await runOn('robertson', 'test/fixtures/exits/exit-on-import.ts');
    expectRefused(r, dir, 'test/fixtures/exits/exit-on-import.ts', /module failed while loading: user code called process.exit\(0\)/);
  });
});

// Through the launcher (a real process; it loads the compiled dist/, which npm test builds first).
describe('exit codes through the launcher: a closed stdout, an exit from a timer', () => {
  const bin = join(import.meta.dirname, '..', 'bin', 'stepgauge.js');
  function launch(args: string[], closeStdout: boolean): Promise<{ code: number | null; stderr: string }> {
    return new Promise((done, fail) => {
      const child = spawn(process.execPath, [bin, ...args], { stdio: ['ignore', 'pipe', 'pipe'] });
      let stderr = '';
      child.stderr.on('data', (b: Buffer) => (stderr += String(b)));
      // `| head -c 1`: the reader takes the first bytes, then goes away.
      if (closeStdout) child.stdout.once('data', () => child.stdout.destroy());
      else child.stdout.resume();
      child.on('error', fail);
      child.on('close', (code) => done({ code, stderr }));
    });
  }
  it('stdout closed by its reader (EPIPE, as `| head`): ends quietly with the command\'s own code, results written', async () => {
    const dir = freshDir();
    const out = join(dir, 'out');
    // The "skipped" line comes first, before the runs; the summary is written after the reader left.
    const r = await launch(['run', '-p', 'van-der-pol,harmonic-oscillator', '-m', 'rk4,stormer-verlet', '-s', '10,20,40,80,160', '--no-timing', '--no-report', '-q', '--out', out], true);
    expect(r.stderr).toBe('');
    const results = JSON.parse(readFileSync(join(out, 'results.json'), 'utf8')) as { runs: { status: string }[] };
    expect(results.runs.length).toBeGreaterThan(5);
    // Failed runs are results: a finished, written sweep exits 0.
    expect(r.code).toBe(0);
  });
  it('a module that calls process.exit(0) from a timer mid-sweep: exit 2 with one line, never 0, no results folder', async () => {
    const dir = freshDir();
    const out = join(dir, 'out');
    const r = await launch(['run', '-p', 'robertson,harmonic-oscillator', '--jobs', '1', '-m', 'test/fixtures/exits/exit-later.ts', '-s', '10,20,40,80', '--no-timing', '--no-report', '-q', '--out', out], false);
    expect(r.code).toBe(2);
    const lines = r.stderr.split('\n').filter(Boolean);
    expect(lines).toHaveLength(1);
    expect(lines[0]).toMatch(/^stepgauge: user code called process\.exit\(0\); .*from a timer or callback outside any run; the command stopped without writing results/);
    expect(existsSync(out)).toBe(false);
  });
});

describe('resume and locks: a changed input is refused, one sweep per folder', () => {
  /** A finished sweep of a copied problem file and method module, turned back into an interrupted one: its journal holds the first run only. */
  async function interruptedSweep(withModule = false): Promise<{ dir: string; out: string; problem: string; method: string }> {
    const dir = freshDir();
    const problem = join(dir, 'decay.yaml');
    const method = join(dir, 'method.ts');
    writeFileSync(problem, 'id: decay\ntitle: Decay\nstates: [x]\nequations: { x: -x }\ninitial: { x: 1 }\nspan: [0, 1]\nreference: { exact: { x: exp(-t) } }\n');
    copyFileSync('test/fixtures/exits/copied-rk4.ts', method);
    const out = join(dir, 'out');
    // A module costs seconds to load (esbuild), so only the tests that need one use it.
    const r = await runCli(['run', '-p', `${problem},harmonic-oscillator`, '-m', withModule ? method : 'rk4', '-s', '10,20', '--no-timing', '-q', '--no-report', '--out', out]);
    expect(r.code, r.stderr).toBe(0);
    const results = JSON.parse(readFileSync(join(out, 'results.json'), 'utf8')) as { request: Record<string, unknown>; plan: { sha256: string }; runs: unknown[] };
    const header = { kind: 'stepgauge-journal', version: 1, planSha256: results.plan.sha256, request: results.request };
    writeFileSync(join(dir, '.out.journal.jsonl'), `${JSON.stringify(header)}\n${JSON.stringify(results.runs[0])}\n`);
    return { dir, out, problem, method };
  }
  it('the recorded inputs: stepgauge version and the SHA-256 of each file', async () => {
    const s = await interruptedSweep(true);
    const header = JSON.parse(readFileSync(join(s.dir, '.out.journal.jsonl'), 'utf8').split('\n')[0]!) as { request: { inputs: { stepgauge: string; files: Record<string, string> } } };
    // SHA-256 of the file bytes as node:crypto computes it (FIPS 180-4).
    const sha = (p: string) => createHash('sha256').update(readFileSync(p)).digest('hex');
    expect(header.request.inputs.files).toEqual({ [s.problem]: sha(s.problem), [s.method]: sha(s.method) });
    expect(header.request.inputs.stepgauge).toBe(JSON.parse(readFileSync('package.json', 'utf8')).version);
    // Unchanged: the resume finishes (exit 0) with every planned run.
    const r = await runCli(['run', '--resume', s.out, '-q', '--no-report']);
    expect(r.code, r.stderr).toBe(0);
  });
  it.each([
    ['the problem file', (s: { problem: string }) => writeFileSync(s.problem, readFileSync(s.problem, 'utf8').replace('x: -x', 'x: -2 * x')), 'decay.yaml (SHA-256'],
    ['the method module', (s: { method: string }) => writeFileSync(s.method, `${readFileSync(s.method, 'utf8')}\n// edited\n`), 'method.ts (SHA-256'],
  ] as const)('--resume after %s changed: exit 2 naming it, nothing written', async (what, change, names) => {
    const s = await interruptedSweep(what === 'the method module');
    change(s);
    const before = readFileSync(join(s.out, 'results.json'), 'utf8');
    const r = await runCli(['run', '--resume', s.out, '-q', '--no-report']);
    expectRefused(r, undefined, join(s.dir, '.out.journal.jsonl'), /cannot resume: changed since the sweep started: .*; run the sweep again/);
    expect(r.stderr).toContain(names);
    expect(readFileSync(join(s.out, 'results.json'), 'utf8')).toBe(before);
    expect(readdirSync(s.dir).sort()).toEqual(['.out.journal.jsonl', 'decay.yaml', 'method.ts', 'out']);
  });
  it('--resume of a journal that recorded no input hashes (an older stepgauge): exit 2, says why', async () => {
    const s = await interruptedSweep();
    const path = join(s.dir, '.out.journal.jsonl');
    const [head, ...rest] = readFileSync(path, 'utf8').split('\n');
    const header = JSON.parse(head!) as { request: Record<string, unknown> };
    delete header.request.inputs;
    writeFileSync(path, [JSON.stringify(header), ...rest].join('\n'));
    const r = await runCli(['run', '--resume', s.out, '-q', '--no-report']);
    expectRefused(r, undefined, path, /did not record the hashes of its inputs/);
  });
  it('--resume after a problem\'s definition changed under the same file hashes (plan changed): exit 2', async () => {
    const s = await interruptedSweep();
    const path = join(s.dir, '.out.journal.jsonl');
    const lines = readFileSync(path, 'utf8').split('\n');
    const header = JSON.parse(lines[0]!) as { planSha256: string };
    header.planSha256 = '0'.repeat(64);
    writeFileSync(path, [JSON.stringify(header), ...lines.slice(1)].join('\n'));
    const r = await runCli(['run', '--resume', s.out, '-q', '--no-report']);
    expectRefused(r, undefined, path, /the sweep's plan changed since it started/);
  });
  it('a folder locked by a live process is refused (exit 2 naming it and the pid); the lock stays', async () => {
    const dir = freshDir();
    const out = join(dir, 'out');
    const lock = join(dir, '.out.lock');
    // This process is alive; the lock says it is writing the folder.
    writeFileSync(lock, JSON.stringify({ pid: process.pid, host: hostname(), startedAt: '2026-01-01T00:00:00Z' }));
    const r = await runCli(['run', '-p', 'harmonic-oscillator', '-m', 'rk4', '-s', '10', '--no-timing', '-q', '--no-report', '--out', out]);
    expectRefused(r, undefined, `--out ${out}`, new RegExp(`another stepgauge sweep \\(pid ${process.pid}, started .*\\) is writing this folder`));
    expect(readdirSync(dir)).toEqual(['.out.lock']);
  });
  it('a lock left by a dead process is taken over, and released after the sweep', async () => {
    const dir = freshDir();
    const out = join(dir, 'out');
    const dead = spawnSync(process.execPath, ['-e', '0']).pid!; // a process that has ended
    writeFileSync(join(dir, '.out.lock'), JSON.stringify({ pid: dead, host: hostname(), startedAt: '2026-01-01T00:00:00Z' }));
    const r = await runCli(['run', '-p', 'harmonic-oscillator', '-m', 'rk4', '-s', '10', '--no-timing', '-q', '--no-report', '--out', out]);
    expect(r.code, r.stderr).toBe(0);
    expect(readdirSync(dir)).toEqual(['out']);
  });
  it('two real sweeps into one folder: the second is refused while the first runs, the first completes', async () => {
    const dir = freshDir();
    const out = join(dir, 'out');
    const bin = join(import.meta.dirname, '..', 'bin', 'stepgauge.js');
    // The first loads a method module (esbuild, a second or more) after taking the lock, so it
    // surely still holds the lock when the second starts.
    const first = spawn(process.execPath, [bin, 'run', '-p', 'van-der-pol,harmonic-oscillator', '-m', 'rk4,test/fixtures/exits/copied-rk4.ts', '-t', '1e-3..1e-8', '-s', '100,200', '--jobs', '1', '--no-timing', '-q', '--no-report', '--out', out], { stdio: 'ignore' });
    const ended = new Promise<number | null>((done) => first.on('close', done));
    while (!existsSync(join(dir, '.out.lock'))) await new Promise((w) => setTimeout(w, 20));
    const second = await runCli(['run', '-p', 'harmonic-oscillator', '-m', 'rk4', '-s', '10', '--no-timing', '-q', '--no-report', '--out', out]);
    expectRefused(second, undefined, `--out ${out}`, new RegExp(`another stepgauge sweep \\(pid ${first.pid}, `));
    expect(await ended).toBe(0);
    const results = JSON.parse(readFileSync(join(out, 'results.json'), 'utf8')) as { runs: unknown[]; plan: { runs: number } };
    expect(results.runs).toHaveLength(results.plan.runs);
    expect(readdirSync(dir)).toEqual(['out']);
  });
});

describe('flags: --run-timeout bounded, --jobs capped, workers see the environment, module output off stdout', () => {
  const fast = ['-p', 'harmonic-oscillator', '-m', 'rk4', '-s', '10', '--no-timing', '-q', '--no-report'];
  it.each(['86401', '2592000', '1e10'])('--run-timeout %s (past a day; Node timers overflow past 2^31 - 1 ms, about 24.8 days): exit 2 naming the flag', async (value) => {
    const dir = freshDir();
    const r = await runCli(['run', ...fast, '--run-timeout', value, '--out', join(dir, 'out')]);
    expectRefused(r, dir, '--run-timeout', /is more than the longest run timeout, 86400 s \(a day\); leave the flag out for no limit$/);
  });
  it('--jobs 1000 is lowered to twice the cores (at least 4) with a note; the sweep runs', async () => {
    const dir = freshDir();
    const r = await runCli(['run', ...fast, '--jobs', '1000', '--out', join(dir, 'out')]);
    expect(r.code, r.stderr).toBe(0);
    const cap = Math.max(4, 2 * availableParallelism());
    expect(r.stderr).toBe(`stepgauge: note: --jobs 1000 lowered to ${cap} (twice the ${availableParallelism()} available cores); more workers would only share the cores\n`);
  });
  // Through the launcher: in process, vitest takes console.log over.
  it('a module printing on stdout: run --json stays JSON at --jobs 1 and 2, the text goes to stderr; workers see the environment', async () => {
    const dir = freshDir();
    const bin = join(import.meta.dirname, '..', 'bin', 'stepgauge.js');
    const messages: string[][] = [];
    for (const jobs of ['1', '2']) {
      const args = ['run', '-p', 'harmonic-oscillator', '-m', 'test/fixtures/exits/chatty-method.ts', '-s', '10,20', '--no-timing', '-q', '--no-report', '--json', '--jobs', jobs, '--out', join(dir, `out${jobs}`)];
      const r = spawnSync(process.execPath, [bin, ...args], { encoding: 'utf8', env: { ...process.env, STEPGAUGE_TEST_MARK: 'seen' } });
      expect(r.status, r.stderr).toBe(0);
      const printed = JSON.parse(r.stdout) as { runs: { message?: string }[] };
      messages.push(printed.runs.map((x) => x.message ?? ''));
      expect(r.stderr).toContain('chatty-method: loaded');
      expect(r.stderr).toContain('chatty-method: solving harmonic-oscillator');
    }
    // The same environment in the main process (--jobs 1) and on the workers (--jobs 2).
    expect(messages).toEqual([['mark=seen', 'mark=seen'], ['mark=seen', 'mark=seen']]);
  });
});

describe('issue 22, model files: references stay in the folder, prototype names refused, sizes capped', () => {
  it.each(MODEL_FILES)('%s', async (fixture, where, says) => {
    const { r, dir } = await runOn(join(BAD, fixture));
    expectRefused(r, dir, where, says);
    // Nothing of the file a path points at reaches the message.
    expect(r.stderr).not.toContain('"name"');
  });

  it('a matrix path to a .env file beside the problem quotes no more than a short cell', async () => {
    const dir = freshDir();
    writeFileSync(join(dir, '.env'), 'API_KEY=sk-not-a-real-secret-0123456789\n');
    writeFileSync(join(dir, 'model.yaml'), 'id: leak\nstates: [q]\nlinear:\n  A: .env\ninitial: [1]\nspan: [0, 1]\n');
    const out = freshDir();
    const r = await runCli(['run', '--problem', join(dir, 'model.yaml'), '-m', 'rk4', '-s', '10', '--no-timing', '-q', '--out', join(out, 'out')]);
    expectRefused(r, out, join(dir, '.env'), /row 1, column 1: a 39-character cell is not a number \(matrix linear\.A\)$/);
    expect(r.stderr).not.toContain('sk-not');
    expect(r.stderr).not.toContain('API_KEY');
  });

  it('a matrix path that is a FIFO is refused at once, without opening it', async () => {
    const dir = freshDir();
    try {
      execFileSync('mkfifo', [join(dir, 'pipe.csv')]);
    } catch {
      return; // no mkfifo here (not a POSIX system): nothing to check
    }
    writeFileSync(join(dir, 'model.yaml'), 'id: pipe\nstates: [q]\nlinear:\n  A: pipe.csv\ninitial: [1]\nspan: [0, 1]\n');
    const out = freshDir();
    const r = await runCli(['run', '--problem', join(dir, 'model.yaml'), '-m', 'rk4', '-s', '10', '--no-timing', '-q', '--out', join(out, 'out')]);
    expectRefused(r, out, `${join(dir, 'model.yaml')}:4:6`, /linear\.A: cannot read matrix file pipe\.csv \(a FIFO \(named pipe\), not a regular file\)$/);
  });

  it('a problem file that is a FIFO is refused, naming --problem', async () => {
    const dir = freshDir();
    try {
      execFileSync('mkfifo', [join(dir, 'model.yaml')]);
    } catch {
      return;
    }
    const out = freshDir();
    const r = await runCli(['run', '--problem', join(dir, 'model.yaml'), '-m', 'rk4', '-s', '10', '--no-timing', '-q', '--out', join(out, 'out')]);
    expectRefused(r, out, `--problem ${join(dir, 'model.yaml')}`, /expected a file, found a FIFO \(named pipe\)$/);
  });

  it(`a problem file over ${MAX_PROBLEM_FILE_BYTES} bytes is refused before it is parsed`, async () => {
    const dir = freshDir();
    const path = join(dir, 'huge.yaml');
    const head = 'id: huge\nstates: [x]\nequations: { x: -x }\ninitial: { x: 1 }\nspan: [0, 1]\n';
    writeFileSync(path, head + '#'.repeat(MAX_PROBLEM_FILE_BYTES) + '\n');
    const out = freshDir();
    const r = await runCli(['run', '--problem', path, '-m', 'rk4', '-s', '10', '--no-timing', '-q', '--out', join(out, 'out')]);
    expectRefused(r, out, path, new RegExp(`cannot read problem file: ${MAX_PROBLEM_FILE_BYTES + head.length + 1} bytes, larger than the 1 MB allowed$`));
  });

  it(`a problem file with more than ${MAX_FILE_STATES} states is refused, naming states`, async () => {
    const dir = freshDir();
    const path = join(dir, 'wide.yaml');
    const names = Array.from({ length: MAX_FILE_STATES + 1 }, (_, k) => `x${k}`);
    writeFileSync(path, `id: wide\nstates: [${names.join(', ')}]\nequations: { ${names.map((n) => `${n}: -${n}`).join(', ')} }\ninitial: { ${names.map((n) => `${n}: 1`).join(', ')} }\nspan: [0, 1]\n`);
    const out = freshDir();
    const r = await runCli(['run', '--problem', path, '-m', 'rk4', '-s', '10', '--no-timing', '-q', '--out', join(out, 'out')]);
    expectRefused(r, out, `${path}:2:9`, new RegExp(`states: lists ${MAX_FILE_STATES + 1} states; a problem file may have at most ${MAX_FILE_STATES}`));
  });

  it('a file without a title loads with its id as the title', async () => {
    const p = await loadProblemFile(join(BAD, 'valid-no-title.yaml'));
    expect(p.title).toBe('spring-untitled');
  });

  it('a symbolic link in the corpus points outside its folder (the case above depends on it)', () => {
    expect(readFileSync(join(BAD, 'cells-link-outside.csv'), 'utf8')).toContain('"name": "stepgauge"');
  });
});

describe('issue 22, results validated before they are written: the failure is recorded in results written as usual', () => {
  it.each(RECORDED_FILES)('%s on %s', async (fixture, other, status, says) => {
    const dir = freshDir();
    const out = join(dir, 'out');
    const module = fixture.endsWith('.ts');
    const args = module ? ['--problem', other, '-m', join(BAD, fixture)] : ['--problem', join(BAD, fixture), '-m', other];
    // With --fail-on-failed-runs the sweep ends 3 (a failed run); the results are written either way.
    const r = await runCli(['run', ...args, '--jobs', '1', '-s', '10', '--no-timing', '-q', '--no-report', '--fail-on-failed-runs', '--out', out]);
    expect(r.code, r.stderr).toBe(3);
    // The tool's own reader accepts what was written.
    const results = readResultsFile(join(out, 'results.json'));
    expect(results.runs).toHaveLength(1);
    const run = results.runs[0]!;
    expect(run.status).toBe(status);
    expect(run.message).toMatch(says);
    expect(run.error).toEqual({ final: null, max: null });
    for (const k of ['nfev', 'njev', 'nlu', 'accepted', 'rejected'] as const) expect(Number.isSafeInteger(run.counts[k]) && run.counts[k] >= 0).toBe(true);
  });

  it('a module message that starts like a formula is written to results.csv as text; numbers stay numbers', async () => {
    const dir = freshDir();
    const out = join(dir, 'out');
    const r = await runCli(['run', '--problem', 'robertson', '-m', join(BAD, 'module-method-formula-message.ts'), '--jobs', '1', '-s', '10', '--no-timing', '-q', '--no-report', '--out', out]);
    expect(r.code, r.stderr).toBe(0);
    const text = readFileSync(join(out, 'results.csv'), 'utf8');
    // The message cell is quoted (it holds commas and quotes), with the apostrophe first.
    expect(text).toContain(`,"'=HYPERLINK(""http://example.invalid"",""x"")"`);
    const rows = parseCsv(text) as string[][];
    expect(rows[1]![CSV_COLUMNS.indexOf('message')]).toBe(`'=HYPERLINK("http://example.invalid","x")`);
  });
});
