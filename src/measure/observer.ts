// What one measured solve watches along the way: the worst error at the solver's own accepted steps
// where the reference can be evaluated (every step for an exact reference, a tabulated one where a
// step ends on its times), the error at the output times from the run's interpolant, each beside
// the reference's resolution at that point; the error of the method's own interpolant at step
// midpoints (src/measure/dense-accuracy.ts); event crossings; the worst drift of every invariant,
// and a thinned drift trace for plots.
import type { Problem } from '../core/types.js';
import type { DriftTrace, OrbitErrorRecord } from '../results/contract.js';
import { errorMeter } from './error-norm.js';
import { referenceLookup } from './reference.js';
import { watchEvents } from './event-watch.js';
import { watchDenseAccuracy } from './dense-accuracy.js';
import { orbitErrorInto } from './orbit-error.js';
import { sampleOutputs, type OutputInterpolant, type StepInterpolant } from './output-times.js';

/** Number of time buckets the drift trace is thinned to (one sample per bucket). */
const TRACE_BUCKETS = 200;
/** Below this an invariant's initial value counts as zero and its drift is absolute. */
const TINY_INVARIANT = 1e-300;

/** A worst error and the reference's resolution where it occurred, in the same units. */
export interface Figure {
  value: number;
  resolution: number;
}

/** The worst of a stream of (error, resolution) pairs; a NaN, once seen, stays. */
class WorstFigure {
  value = -1;
  resolution = 0;
  count = 0;

  add(e: number, r: number): void {
    this.count++;
    if (this.value !== this.value) return;
    if (e > this.value || e !== e) {
      this.value = e;
      this.resolution = r;
    }
  }

  figure(): Figure | null {
    return this.count > 0 ? { value: this.value, resolution: this.resolution } : null;
  }
}

export interface RunWatch {
  readonly observer: (t: number, y: Float64Array) => void;
  /** For methods with their own interpolant: every accepted step with it (output times use it). */
  readonly denseStep: (tOld: number, tNew: number, evaluate: StepInterpolant) => void;
  /** Worst scaled error over the solver's steps with a reference (null when none had one). */
  maxError(): number | null;
  /** The same with the reference's resolution at that point. */
  along(): Figure | null;
  /** Worst error at the output times, from the run's values there (null: no output times). */
  outputs(): Figure | null;
  /** Which interpolant gave the values at output times (null: none was needed). */
  outputInterpolant(): OutputInterpolant | null;
  /** Worst error of the method's own interpolant at step midpoints (null: no interpolant or no reference there). */
  dense(): Figure | null;
  drift(): Record<string, number>;
  trace(): DriftTrace | undefined;
  /** How many observed points were compared with the reference. */
  comparedPoints(): number;
  /** Largest part of the orbit error along the run and its trace (problems that name an orbit). */
  orbitAlong(): Pick<OrbitErrorRecord, 'max' | 'trace'> | undefined;
  /** Event crossing times found (problems with events). */
  eventsFound(): Record<string, number[]> | undefined;
  /** Right-hand-side evaluations made to locate events, outside the method's counts. */
  eventEvaluations(): number;
}

/**
 * A growing list of numbers in a Float64Array. A plain array that starts with an integer such
 * as t0 = 0 changes its element kind at the first fraction, which throws away the observer's
 * optimised code (a deoptimisation per run).
 */
class NumberLog {
  private data = new Float64Array(64);
  length = 0;

  push(v: number): void {
    if (this.length === this.data.length) {
      const grown = new Float64Array(this.data.length * 2);
      grown.set(this.data);
      this.data = grown;
    }
    this.data[this.length++] = v;
  }

  toArray(): number[] {
    return Array.from(this.data.subarray(0, this.length));
  }
}

export function watchRun(problem: Problem, methodInterpolant = false): RunWatch {
  const n = problem.dimension;
  const lookup = referenceLookup(problem);
  const referenceAt = lookup.at;
  const meter = errorMeter(problem);
  const ref = new Float64Array(n);
  const res = new Float64Array(n);
  const worstAlong = new WorstFigure();
  const worstOutput = new WorstFigure();
  const outRef = new Float64Array(n);
  const outRes = new Float64Array(n);
  const outputs = sampleOutputs(problem, methodInterpolant, (t, y) => {
    if (referenceAt(t, outRef, outRes)) worstOutput.add(meter.error(t, y, outRef, outRes), meter.resolution);
  });
  const invariants = problem.invariants;
  const invariantFns = invariants.map((inv) => inv.fn);
  const invariantCount = invariants.length;
  const initial = new Float64Array(invariantCount);
  const worstDrift = new Float64Array(invariantCount);
  const traceT = new NumberLog();
  const traceD = invariants.map(() => new NumberLog());
  // The closure reads these locals, never the problem: problems from different sources are
  // different objects to V8, and a hot closure that reads fields of many kinds of object is
  // compiled again for each.
  const t0 = problem.t0;
  const tEnd = problem.tEnd;
  const span = tEnd - t0;
  let lastBucket = -1;
  let started = false;

  const orbit = problem.orbit;
  const ric = new Float64Array(4);
  const worstRic = new Float64Array(4);
  let ricCompared = 0;
  let lastRicBucket = -1;
  const ricT = new NumberLog();
  const ricParts = [new NumberLog(), new NumberLog(), new NumberLog()];
  const events = watchEvents(problem, methodInterpolant);
  const worstDense = new WorstFigure();
  const dense = methodInterpolant ? watchDenseAccuracy(problem, lookup, meter, (e, r) => worstDense.add(e, r)) : null;

  const observer = (t: number, y: Float64Array): void => {
    if (events) events.observe(t, y);
    if (!started) {
      for (let k = 0; k < invariantCount; k++) initial[k] = invariantFns[k]!(t, y);
      started = true;
    }
    outputs.observe(t, y);
    const compared = referenceAt(t, ref, res);
    if (compared) worstAlong.add(meter.error(t, y, ref, res), meter.resolution);
    if (orbit && compared) {
      orbitErrorInto(y, ref, orbit, ric);
      ricCompared++;
      for (let k = 0; k < 4; k++) {
        const a = Math.abs(ric[k]!);
        if (worstRic[k]! === worstRic[k]! && (a > worstRic[k]! || a !== a)) worstRic[k] = a;
      }
      const bucket = Math.floor(((t - t0) / span) * TRACE_BUCKETS);
      if (bucket > lastRicBucket || t === tEnd) {
        lastRicBucket = bucket;
        ricT.push(t);
        for (let k = 0; k < 3; k++) ricParts[k]!.push(ric[k + 1]!);
      }
    }
    if (invariantCount === 0) return;
    const bucket = Math.floor(((t - t0) / span) * TRACE_BUCKETS);
    const record = bucket > lastBucket || t === tEnd;
    if (record) {
      lastBucket = bucket;
      traceT.push(t);
    }
    for (let k = 0; k < invariantCount; k++) {
      const i0 = initial[k]!;
      const denom = Math.abs(i0) > TINY_INVARIANT ? Math.abs(i0) : 1;
      const d = Math.abs(invariantFns[k]!(t, y) - i0) / denom;
      const was = worstDrift[k]!;
      if (was === was && (d > was || d !== d)) worstDrift[k] = d; // NaN, once seen, stays
      if (record) traceD[k]!.push(d);
    }
  };

  return {
    observer,
    denseStep(tOld, tNew, evaluate) {
      if (events) events.step(tOld, tNew, evaluate);
      if (dense) dense.step(tOld, tNew, evaluate);
      outputs.step(tOld, tNew, evaluate);
    },
    maxError: () => worstAlong.figure()?.value ?? null,
    along: () => worstAlong.figure(),
    outputs: () => worstOutput.figure(),
    outputInterpolant: () => outputs.interpolant(),
    dense: () => worstDense.figure(),
    comparedPoints: () => worstAlong.count,
    orbitAlong() {
      if (!orbit || ricCompared === 0) return undefined;
      return {
        max: { position: worstRic[0]!, radial: worstRic[1]!, inTrack: worstRic[2]!, crossTrack: worstRic[3]! },
        trace: { t: ricT.toArray(), radial: ricParts[0]!.toArray(), inTrack: ricParts[1]!.toArray(), crossTrack: ricParts[2]!.toArray() },
      };
    },
    eventsFound: () => events?.found(),
    eventEvaluations: () => events?.evaluations() ?? 0,
    drift() {
      const out: Record<string, number> = {};
      invariants.forEach((inv, k) => (out[inv.name] = worstDrift[k]!));
      return out;
    },
    trace() {
      if (invariantCount === 0) return undefined;
      const drift: Record<string, number[]> = {};
      invariants.forEach((inv, k) => (drift[inv.name] = traceD[k]!.toArray()));
      return { t: traceT.toArray(), drift };
    },
  };
}
