// Certified references for problems without an exact or published one, made hard to fool: two
// methods of different kinds at very tight tolerance, and the first again with its step bounded
// (so a feature shorter than the natural step, a brief pulse say, cannot be stepped over by all
// of them). The reference is the bounded run, kept whole as a dense reference (its accepted steps
// joined by Hermite interpolation, ./dense-reference.ts) so it can be evaluated at any time; the
// trust is the worst agreement between it, interpolated, and the other two runs, which land on
// the evaluation points. Fewer than two trusted digits is no reference at all.
// Cached on disk by the problem's hash, so a sweep (and each worker) certifies a problem once.
import { existsSync, mkdirSync, readFileSync, renameSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import type { Method, Problem, ReferencePoint } from '../core/types.js';
import { sha256 } from '../core/hash.js';
import { absoluteTolerance } from '../core/tolerance.js';
import { findMethod } from '../methods/registry.js';
import { scaleFloors, scaledMaxError } from './error-norm.js';
import { denseEvaluator, stepRecorder, type DenseSteps } from './dense-reference.js';

/** Tolerances of the two certifying runs: near the limit of double precision for such pairs. */
const CERTIFY_RTOL_NONSTIFF = 1e-13;
const CERTIFY_RTOL_STIFF = 1e-12;
const CERTIFY_MAX_STEPS = 5_000_000;
/** Digits are capped where double precision ends. */
const MAX_DIGITS = 15;
/** Evaluation points spread evenly over the span (besides the check times), where trust is measured. */
const EVALUATION_POINTS = 200;
/** The bounded run's largest step is the span over this (about 0.05% of the span). */
const BOUNDED_STEPS = 2000;
/** Fewer trusted digits than this: the certificate is no reference (warning, errors null). */
export const MIN_CERTIFIED_DIGITS = 2;
/** Bumped when the certificate's recipe changes, so older cached certificates are not reused. */
const RECIPE = 3;

/**
 * Non-stiff: an embedded Runge-Kutta pair and a Gragg-Bulirsch-Stoer extrapolation code (different
 * families). Stiff: a collocation (Radau IIA) and a multistep (BDF) method, both implicit.
 */
const PAIRS = {
  nonstiff: ['dormand-prince-853', 'odex'],
  stiff: ['radau-iia-5', 'bdf-variable'],
} as const;

export interface CertifyingRun {
  method: string;
  rtol: number;
  /** Largest step allowed (the bounded run). */
  maxStep?: number;
}

export interface Certificate {
  recipe: number;
  points: ReferencePoint[];
  /** The bounded run's accepted steps: the reference anywhere in the span. */
  dense: DenseSteps;
  digits: number;
  runs: CertifyingRun[];
}

export function cacheDir(): string {
  return process.env.STEPGAUGE_CACHE ?? join(process.cwd(), '.stepgauge-cache');
}

export function needsCertificate(p: Problem): boolean {
  return p.reference.kind === 'certified' && !p.reference.exact && (p.reference.points?.length ?? 0) === 0;
}

function certifyTimes(p: Problem): number[] {
  const all = new Set<number>(p.checkTimes.filter((t) => t > p.t0 && t <= p.tEnd));
  for (let k = 1; k <= EVALUATION_POINTS; k++) all.add(k === EVALUATION_POINTS ? p.tEnd : p.t0 + ((p.tEnd - p.t0) * k) / EVALUATION_POINTS);
  return [...all].sort((a, b) => a - b);
}

/** The bounded run, recorded at every accepted step (it does not land on the evaluation points). */
function recordDense(p: Problem, method: Method, run: CertifyingRun): DenseSteps {
  const recorder = stepRecorder(p);
  const result = method.solve(
    p,
    { rtol: run.rtol, atol: absoluteTolerance(p, run.rtol) },
    { maxSteps: CERTIFY_MAX_STEPS, observer: recorder.observe, ...(run.maxStep !== undefined ? { maxStep: run.maxStep } : {}) },
  );
  if (result.status !== 'ok') {
    throw new Error(`certifying ${p.id}: ${method.id} at rtol ${run.rtol} ended with ${result.status}${result.message ? ` (${result.message})` : ''}`);
  }
  return recorder.steps;
}

function sampleAt(p: Problem, method: Method, run: CertifyingRun, times: number[]): number[][] {
  const want = new Set(times);
  const rows = new Map<number, number[]>();
  const rtol = run.rtol;
  const result = method.solve(
    p,
    { rtol, atol: absoluteTolerance(p, rtol) },
    {
      maxSteps: CERTIFY_MAX_STEPS,
      checkTimes: times.filter((t) => t !== p.tEnd),
      observer: (t, y) => void (want.has(t) && rows.set(t, Array.from(y))),
      ...(run.maxStep !== undefined ? { maxStep: run.maxStep } : {}),
    },
  );
  if (result.status !== 'ok') {
    throw new Error(`certifying ${p.id}: ${method.id} at rtol ${rtol} ended with ${result.status}${result.message ? ` (${result.message})` : ''}`);
  }
  rows.set(p.tEnd, Array.from(result.yFinal));
  return times.map((t) => {
    const row = rows.get(t);
    if (!row) throw new Error(`certifying ${p.id}: ${method.id} did not land on t = ${t}`);
    return row;
  });
}

export function certify(p: Problem): Certificate {
  const [idA, idB] = p.stiff ? PAIRS.stiff : PAIRS.nonstiff;
  const a = findMethod(idA);
  const b = findMethod(idB);
  if (!a || !b) throw new Error(`certifying ${p.id} needs methods ${idA} and ${idB}`);
  const rtol = p.stiff ? CERTIFY_RTOL_STIFF : CERTIFY_RTOL_NONSTIFF;
  const times = certifyTimes(p);
  const runs: CertifyingRun[] = [
    { method: idA, rtol, maxStep: (p.tEnd - p.t0) / BOUNDED_STEPS },
    { method: idA, rtol },
    { method: idB, rtol },
  ];
  const dense = recordDense(p, a, runs[0]!);
  const evaluate = denseEvaluator(dense, p.dimension);
  const out = new Float64Array(p.dimension);
  const reference = times.map((t) => (evaluate(t, out), Array.from(out)));
  const rows = [reference, ...runs.slice(1).map((r) => sampleAt(p, r.method === idA ? a : b, r, times))];
  // Agreement is measured in the problem's own error scale, relative per component with the
  // problem's floor, or relative to the state's size for absolute scales; every run against
  // the bounded one, interpolated (its values become the reference), at every evaluation point.
  const floors = scaleFloors(p.errorScale, p.dimension);
  let worst = 0;
  times.forEach((_, k) => {
    const ref = rows[0]![k]!;
    for (let r = 1; r < rows.length; r++) {
      let e = scaledMaxError(rows[r]![k]!, ref, floors, p.dimension);
      if (!floors) e /= Math.max(1e-300, ...ref.map(Math.abs));
      worst = Math.max(worst, e !== e ? Infinity : e);
    }
  });
  const digits = worst === 0 ? MAX_DIGITS : Math.max(0, Math.min(MAX_DIGITS, Math.floor(-Math.log10(worst))));
  return { recipe: RECIPE, points: times.map((t, k) => ({ t, y: rows[0]![k]! })), dense, digits, runs };
}

function runText(r: CertifyingRun): string {
  return `${r.method} at rtol ${r.rtol}${r.maxStep !== undefined ? ` with steps at most ${r.maxStep.toPrecision(3)}` : ''}`;
}

/**
 * The problem with its certified reference filled in (from the cache when present). When
 * certification fails (the model diverges at tight tolerance, say) the problem keeps no reference
 * and says why, so its runs are recorded as failed while the rest of the sweep goes on.
 */
export function withCertifiedReference(p: Problem): Problem {
  if (!needsCertificate(p)) return p;
  try {
    return certified(p);
  } catch (e) {
    return withoutReference(p, `could not certify a reference for ${p.id}: ${e instanceof Error ? e.message : String(e)}`);
  }
}

/** The problem marked as having no reference, and why (a problem that needs none is kept as is). */
export function withoutReference(p: Problem, why: string): Problem {
  if (!needsCertificate(p)) return p;
  return { ...p, reference: { kind: 'certified', points: [], unavailable: why } };
}

function certificateFile(p: Problem): string {
  return join(cacheDir(), `certified-${sha256(p.definition)}.json`);
}

/** Whether a certificate for this exact definition is already in the cache. */
export function certificateCached(p: Problem): boolean {
  return existsSync(certificateFile(p));
}

/** What certifying `p` will do, in words (for the note said before it starts). */
export function certificationPlan(p: Problem): string {
  const [a, b] = p.stiff ? PAIRS.stiff : PAIRS.nonstiff;
  const rtol = p.stiff ? CERTIFY_RTOL_STIFF : CERTIFY_RTOL_NONSTIFF;
  return `${a} and ${b} at rtol ${rtol}, and ${a} again with steps at most 1/${BOUNDED_STEPS} of the span; the digits on which all three agree become its trust; cached in ${cacheDir()}`;
}

function certified(p: Problem): Problem {
  const dir = cacheDir();
  const file = certificateFile(p);
  let cert: Certificate | undefined;
  if (existsSync(file)) {
    try {
      cert = JSON.parse(readFileSync(file, 'utf8')) as Certificate;
      if (cert.recipe !== RECIPE) cert = undefined; // made by an older recipe: made again
    } catch {
      cert = undefined; // a damaged cache entry is recomputed
    }
  }
  if (!cert) {
    cert = certify(p);
    mkdirSync(dir, { recursive: true });
    const tmp = `${file}.${process.pid}.tmp`;
    writeFileSync(tmp, JSON.stringify(cert));
    renameSync(tmp, file);
  }
  const by = cert.runs.map(runText).join('; ');
  if (cert.digits < MIN_CERTIFIED_DIGITS) {
    const why = `no reference for ${p.id}: the certifying runs (${by}) agree to ${cert.digits} digit${cert.digits === 1 ? '' : 's'}, fewer than ${MIN_CERTIFIED_DIGITS}`;
    return { ...p, reference: { kind: 'certified', points: [], untrusted: why } };
  }
  return {
    ...p,
    reference: {
      kind: 'certified',
      digits: cert.digits,
      points: cert.points,
      dense: denseEvaluator(cert.dense, p.dimension),
      certifiedBy: { methods: [...new Set(cert.runs.map((r) => r.method))], rtol: cert.runs[0]!.rtol, runs: cert.runs.map((r) => ({ ...r })) },
      source: `certified by stepgauge: ${by} agree to ${cert.digits} digits at ${cert.points.length} evaluation points; evaluated between the bounded run's steps by Hermite interpolation`,
    },
  };
}
