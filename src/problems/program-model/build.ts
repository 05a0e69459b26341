// A problem whose model only the user's program has (`model: program`): states, initial values,
// span, parameters and error scale as in any problem file, no equations. Its reference is a
// trajectory computed elsewhere (a CSV with its digits and source) or a self-reference (the program
// at a much tighter setting, worked out per program by the sweep).
import { readFileSync } from 'node:fs';
import { basename, dirname, resolve } from 'node:path';
import type { Reference, ReferencePoint } from '../../core/types.js';
import { sha256 } from '../../core/hash.js';
import { canonicalJson } from '../file/canonical.js';
import { fail } from '../file/fail.js';
import type { StructuredFile } from '../file/read-structured.js';
import type { ProgramModelFile } from '../file/schema.js';
import type { UserProblem } from '../user-problem.js';
import { compileScalarFunction } from '../equations/codegen.js';
import { readCheckTimes, readErrorScale, readSpan } from '../equations/common-fields.js';
import { constantValue, emitField, evaluateParameters } from '../equations/constants.js';
import { checkName, makeScope } from '../equations/names.js';

/** Relative closeness of the trajectory's last time to the span's end. */
const END_MATCH = 1e-12;

function readTrajectory(site: StructuredFile, spec: ProgramModelFile, states: readonly string[], t0: number, tEnd: number, problemFile: string): { points: ReferencePoint[]; hash: string } {
  const path = ['reference', 'trajectory'];
  const csv = resolve(dirname(problemFile), spec.reference.trajectory!);
  let text: string;
  try {
    text = readFileSync(csv, 'utf8');
  } catch (e) {
    fail(site, path, `cannot read ${csv} (${(e as NodeJS.ErrnoException).code ?? String(e)})`);
  }
  const lines = text.split(/\r?\n/).filter((l) => l.trim() !== '');
  const expected = ['t', ...states].join(',');
  const header = (lines[0] ?? '').split(',').map((s) => s.trim()).join(',');
  if (header !== expected) fail(site, path, `${basename(csv)}: the first line must be the header ${expected} (got ${JSON.stringify((lines[0] ?? '').slice(0, 80))})`);
  const points: ReferencePoint[] = [];
  let last = -Infinity;
  for (let k = 1; k < lines.length; k++) {
    const cells = lines[k]!.split(',').map((c) => Number(c.trim()));
    if (cells.length !== states.length + 1 || cells.some((v) => !Number.isFinite(v))) {
      fail(site, path, `${basename(csv)} line ${k + 1}: expected ${states.length + 1} finite numbers`);
    }
    const t = cells[0]!;
    if (!(t > last)) fail(site, path, `${basename(csv)} line ${k + 1}: times must increase`);
    if (t < t0 || t > tEnd + END_MATCH * Math.abs(tEnd - t0)) fail(site, path, `${basename(csv)} line ${k + 1}: time ${t} is outside the span [${t0}, ${tEnd}]`);
    last = t;
    if (t > t0) points.push({ t, y: cells.slice(1) });
  }
  if (points.length === 0 || Math.abs(last - tEnd) > END_MATCH * Math.abs(tEnd - t0)) {
    fail(site, path, `${basename(csv)} must end at the span's end t = ${tEnd} (the final error is measured there)`);
  }
  points[points.length - 1] = { t: tEnd, y: points[points.length - 1]!.y };
  return { points, hash: sha256(text) };
}

export function buildProgramModelProblem(site: StructuredFile, spec: ProgramModelFile, problemFile: string): UserProblem {
  const taken = new Map<string, string>();
  const states = spec.states;
  states.forEach((s, i) => checkName(site, ['states', i], s, taken, 'state'));
  const n = states.length;
  const parameters = evaluateParameters(site, spec.parameters, (path, name) => checkName(site, path, name, taken, 'parameter'));
  for (const key of Object.keys(spec.initial)) if (!states.includes(key)) fail(site, ['initial', key], `'${key}' is not a state (states: ${states.join(', ')})`);
  const missing = states.find((s) => !(s in spec.initial));
  if (missing !== undefined) fail(site, ['initial'], `state '${missing}' has no initial value`);
  const y0 = states.map((s) => constantValue(site, ['initial', s], spec.initial[s]!, parameters));
  const { t0, tEnd } = readSpan(site, spec.span, parameters);
  const checkTimes = readCheckTimes(site, spec.checkTimes, t0, tEnd, parameters);
  if (spec.error?.measure === 'outputs') fail(site, ['error', 'measure'], 'a program model has no outputs; its error is measured on the states');
  const errorScale = readErrorScale(site, spec.error, states);
  const scope = makeScope({ time: true, states, parameters });
  const invariants = Object.entries(spec.invariants ?? {}).map(([name, text]) => ({
    name,
    fn: compileScalarFunction(n, emitField(site, ['invariants', name], text, scope).js, []),
  }));

  const ref = spec.reference;
  if ((ref.trajectory === undefined) === (ref.self === undefined)) {
    fail(site, ['reference'], 'a program model needs exactly one of `trajectory: <csv file>` (with digits and source) or `self: true`');
  }
  let reference: Reference;
  let trajectoryHash: string | undefined;
  if (ref.trajectory !== undefined) {
    if (ref.digits === undefined) fail(site, ['reference', 'digits'], 'a reference trajectory needs `digits`: how many significant digits of it are trusted');
    if (!ref.source) fail(site, ['reference', 'source'], 'a reference trajectory needs `source`: the tool and settings that computed it');
    const { points, hash } = readTrajectory(site, spec, states, t0, tEnd, problemFile);
    trajectoryHash = hash;
    reference = { kind: 'trajectory', digits: ref.digits, source: ref.source, points };
  } else {
    if (ref.digits !== undefined) fail(site, ['reference', 'digits'], "a self-reference's trust is measured (from its two tightest settings), not declared");
    reference = { kind: 'self', source: ref.source ?? 'self-reference: each program at a much tighter setting, trust from its two tightest settings' };
  }

  const id = spec.id;
  return {
    id,
    title: spec.title ?? spec.id,
    source: spec.source ?? `user problem file ${basename(site.file)} (no source named)`,
    description: spec.description ?? `a model that lives in the user's program: states ${states.join(', ')}; no equations in stepgauge`,
    dimension: n,
    stateNames: states,
    t0,
    tEnd,
    y0,
    f: () => {
      throw new Error(`${id} has no equations (its model lives only in the user's program): only external programs can run it`);
    },
    jacobianSource: 'finite-difference',
    jacobianNote: 'no equations: the model lives in the user program',
    stiff: spec.stiff ?? false,
    invariants,
    errorScale,
    errorOn: 'states',
    reference,
    checkTimes,
    separableReason: 'no equations: the model lives in the user program',
    ...(spec.atolScale !== undefined ? { atolScale: spec.atolScale } : {}),
    parameters: Object.fromEntries(parameters),
    modelOnlyInPrograms: true,
    definition: canonicalJson(trajectoryHash ? { file: site.data, trajectorySha256: trajectoryHash } : site.data),
    origin: site.file,
  };
}
