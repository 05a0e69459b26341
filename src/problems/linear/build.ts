// Builds a Problem from a linear state-space file: x' = A x + B u(t), y = C x + D u(t).
import { readUnits } from '../file/units.js';
import { basename } from 'node:path';
import type { Reference } from '../../core/types.js';
import { canonicalJson } from '../file/canonical.js';
import { fail } from '../file/fail.js';
import type { StructuredFile } from '../file/read-structured.js';
import type { LinearFile } from '../file/schema.js';
import { PROTOTYPE_NAMES } from '../file/prototype-keys.js';
import { readCheckTimes, readErrorScale, readReferencePoints, readSpan } from '../equations/common-fields.js';
import { compileScalarFunction } from '../equations/codegen.js';
import { constantValue, emitField, evaluateParameters } from '../equations/constants.js';
import { checkName, makeScope, MAX_FILE_STATES } from '../equations/names.js';
import { findSeparableSplit, secondOrderForm } from '../equations/separable.js';
import type { UserProblem } from '../user-problem.js';
import { augmentedSystem, exactSolution, EXPM_FLOOR } from './exact.js';
import { expectShape, readMatrix, type Matrix } from './matrix.js';
import { readSignal, type Signal } from './signals.js';

export async function buildLinearProblem(site: StructuredFile, spec: LinearFile, absolutePath: string): Promise<UserProblem> {
  const taken = new Map<string, string>();
  const parameters = evaluateParameters(site, spec.parameters, (path, name) => checkName(site, path, name, taken, 'parameter'));
  const A = await readMatrix(site, ['linear', 'A'], spec.linear.A, absolutePath, parameters);
  if (A.rows !== A.cols) fail(site, ['linear', 'A'], `must be square (n x n, n = number of states); got ${A.rows} x ${A.cols}`);
  const n = A.rows;
  if (n > MAX_FILE_STATES) fail(site, ['linear', 'A'], `is ${n} x ${n}; a problem file may have at most ${MAX_FILE_STATES} states (write a larger model as a problem module)`);

  const states = spec.states ?? Array.from({ length: n }, (_, i) => `x${i + 1}`);
  if (states.length !== n) fail(site, ['states'], `lists ${states.length} states but A is ${n} x ${n}`);
  states.forEach((s, i) => checkName(site, ['states', i], s, taken, 'state'));

  const { t0, tEnd } = readSpan(site, spec.span, parameters);
  const inputs: Signal[] = (spec.inputs ?? []).map((s, c) => readSignal(site, ['inputs', c], s, parameters, t0));
  const m = inputs.length;

  let B: Matrix | undefined;
  if (spec.linear.B !== undefined) {
    B = await readMatrix(site, ['linear', 'B'], spec.linear.B, absolutePath, parameters);
    if (m === 0) fail(site, ['inputs'], `B has ${B.cols} column(s), one per input, but no inputs are given`);
    expectShape(site, ['linear', 'B'], B, n, m, `n x m: n = ${n} states from A, m = ${m} inputs`);
  } else if (m > 0) fail(site, ['linear'], `${m} input(s) given but no B matrix (n x m = ${n} x ${m})`);

  let C: Matrix | undefined;
  let D: Matrix | undefined;
  if (spec.linear.C !== undefined) {
    C = await readMatrix(site, ['linear', 'C'], spec.linear.C, absolutePath, parameters);
    if (C.cols !== n) fail(site, ['linear', 'C'], `must have ${n} columns (p x n, n = ${n} states); got ${C.rows} x ${C.cols}`);
  }
  if (spec.linear.D !== undefined) {
    if (!C) fail(site, ['linear', 'D'], 'D needs a C matrix (y = C x + D u)');
    D = await readMatrix(site, ['linear', 'D'], spec.linear.D, absolutePath, parameters);
    expectShape(site, ['linear', 'D'], D, C.rows, m, `p x m: p = ${C.rows} outputs from C, m = ${m} inputs`);
  }

  if (spec.initial.length !== n) fail(site, ['initial'], `has ${spec.initial.length} values; the model has ${n} states (${states.join(', ')})`);
  const y0 = spec.initial.map((v, i) => constantValue(site, ['initial', i], v, parameters));
  const checkTimes = readCheckTimes(site, spec.checkTimes, t0, tEnd, parameters);

  const a = A.data;
  const b = B?.data ?? new Float64Array(0);
  const u = new Float64Array(m);
  const inputFns = inputs.map((s) => s.value);
  const evalInputs = (t: number): void => {
    for (let c = 0; c < m; c++) u[c] = inputFns[c]!(t);
  };
  const f = (t: number, y: Float64Array, dy: Float64Array): void => {
    evalInputs(t);
    for (let i = 0; i < n; i++) {
      let s = 0;
      for (let c = 0; c < m; c++) s += b[i * m + c]! * u[c]!;
      for (let j = 0; j < n; j++) s += a[i * n + j]! * y[j]!;
      dy[i] = s;
    }
  };
  const jacobian = (_t: number, _y: Float64Array, jac: Float64Array): void => {
    jac.set(a);
  };

  const outputs = C ? linearOutputs(site, spec, C, D, n, m, u, evalInputs) : undefined;
  const errorOn = spec.error?.measure ?? 'states';
  if (errorOn === 'outputs' && !outputs) fail(site, ['error', 'measure'], 'measure: outputs needs a C matrix');
  const errorScale = readErrorScale(site, spec.error, errorOn === 'outputs' ? outputs!.names : states);

  const stateScope = makeScope({ time: true, states, parameters });
  const invariants = Object.entries(spec.invariants ?? {}).map(([name, text]) => ({
    name,
    fn: compileScalarFunction(n, emitField(site, ['invariants', name], text, stateScope).js, []),
  }));

  const deps = Array.from({ length: n }, (_, i) => new Set(states.flatMap((_, j) => (a[i * n + j] !== 0 ? [j] : []))));
  const usesTime = Array.from({ length: n }, (_, i) => inputs.some((s, c) => !s.constant && b[i * m + c] !== 0));
  const split = findSeparableSplit({ names: states, deps, usesTime });
  // A row x_i' = x_j (a single 1 in A, nothing from the inputs) is a position whose rate is a velocity.
  const bareState = Array.from({ length: n }, (_, i): number | null => {
    const cols = [...deps[i]!];
    const fromInputs = inputs.some((_, c) => b[i * m + c] !== 0);
    return cols.length === 1 && a[i * n + cols[0]!] === 1 && !fromInputs ? cols[0]! : null;
  });

  let reference: Reference;
  if (inputs.every((s) => s.generator)) {
    if (spec.reference) fail(site, ['reference'], 'every input has a generator, so the exact solution is computed; remove `reference`');
    const aug = augmentedSystem(a, b, n, inputs.map((s) => s.generator!), y0);
    reference = {
      kind: 'exact',
      source: `expm(M (t - t0)) z0 for the ${aug.size}-state system augmented with the inputs' generators (Pade scaling and squaring, Higham 2005)`,
      exact: exactSolution(aug, n, t0, tEnd),
      floor: EXPM_FLOOR,
    };
  } else if (spec.reference) {
    reference = {
      kind: 'published',
      source: spec.reference.source ?? 'values given in the problem file; the file names no source for them',
      points: readReferencePoints(site, spec.reference.at, states, t0, tEnd),
      ...(spec.reference.digits !== undefined ? { digits: spec.reference.digits } : {}),
    };
  } else {
    reference = { kind: 'certified', points: [] };
  }

  const canonical = {
    ...(site.data as Record<string, unknown>),
    linear: Object.fromEntries(
      (['A', 'B', 'C', 'D'] as const).flatMap((k) => {
        const mat = { A, B, C, D }[k];
        return mat ? [[k, mat.canonical]] : [];
      }),
    ),
  };

  return {
    id: spec.id,
    title: spec.title ?? spec.id,
    source: spec.source ?? `user problem file ${basename(site.file)} (no source named)`,
    description: spec.description ?? `linear state-space model x' = A x + B u, ${n} states, ${m} input(s)${C ? `, ${C.rows} output(s) y = C x + D u` : ''}`,
    dimension: n,
    stateNames: states,
    t0,
    tEnd,
    y0,
    f,
    jacobian,
    jacobianSource: 'symbolic',
    linear: {
      A: a,
      B: b,
      inputs: m,
      input: (t: number, out: Float64Array) => {
        for (let c = 0; c < m; c++) out[c] = inputFns[c]!(t);
      },
    },
    stiff: spec.stiff ?? false,
    invariants,
    errorScale,
    errorOn,
    ...(outputs ? { outputs } : {}),
    reference,
    checkTimes,
    ...(spec.landOnCheckTimes ? { landOnCheckTimes: true } : {}),
    ...('split' in split ? { separable: secondOrderForm(split.split, bareState) } : { separableReason: split.reason }),
    ...(spec.atolScale !== undefined ? { atolScale: spec.atolScale } : {}),
    ...(spec.units ? { units: readUnits(site, spec.units, states, outputs?.names ?? []) } : {}),
    definition: canonicalJson(canonical),
    origin: site.file,
  };
}

function linearOutputs(site: StructuredFile, spec: LinearFile, C: Matrix, D: Matrix | undefined, n: number, m: number, u: Float64Array, evalInputs: (t: number) => void) {
  const p = C.rows;
  const names = spec.outputs ?? Array.from({ length: p }, (_, k) => `y${k + 1}`);
  if (names.length !== p) fail(site, ['outputs'], `names ${names.length} outputs but C has ${p} rows`);
  names.forEach((name, k) => {
    if (PROTOTYPE_NAMES.has(name)) fail(site, ['outputs', k], `output name '${name}' cannot be used (it is special to JavaScript objects)`);
  });
  const c = C.data;
  const d = D?.data;
  const fn = (t: number, y: Float64Array, out: Float64Array): void => {
    if (d) evalInputs(t);
    for (let k = 0; k < p; k++) {
      let s = 0;
      for (let j = 0; j < n; j++) s += c[k * n + j]! * y[j]!;
      if (d) for (let q = 0; q < m; q++) s += d[k * m + q]! * u[q]!;
      out[k] = s;
    }
  };
  return { names, fn };
}
