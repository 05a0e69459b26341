// A run's number arrays as they cross from a worker to the main process. The structured clone
// writes a plain array element by element and reads it back as one boxed number per element
// (three times the memory of a flat double array, and garbage the main process then collects);
// a Float64Array crosses as its bytes. The worker swaps its run's arrays (the state at the end,
// the drift traces) for Float64Arrays just before answering, the main process swaps them back to
// plain arrays on arrival: values, NaN, infinities and -0 included, come through unchanged.
import type { RunResult } from '../core/results.js';

function eachArray(run: RunResult, swap: (a: ArrayLike<number>) => ArrayLike<number>): RunResult {
  const arrays = run as unknown as { yFinal: ArrayLike<number>; trace?: { t: ArrayLike<number>; drift: Record<string, ArrayLike<number>> } };
  if (arrays.yFinal) arrays.yFinal = swap(arrays.yFinal);
  if (arrays.trace) {
    arrays.trace.t = swap(arrays.trace.t);
    for (const k of Object.keys(arrays.trace.drift)) arrays.trace.drift[k] = swap(arrays.trace.drift[k]!);
  }
  return run;
}

/** In the worker, just before the run is sent: its arrays become Float64Arrays (in place). */
export function packRun(run: RunResult): RunResult {
  return eachArray(run, (a) => Float64Array.from(a));
}

/** A plain array of doubles; Array.from takes the iterator path, several times slower. */
function plainArray(a: ArrayLike<number>): number[] {
  const out: number[] = [];
  for (let i = 0; i < a.length; i++) out.push(a[i]!);
  return out;
}

/** In the main process, on arrival: the arrays become plain number arrays again (in place). */
export function unpackRun(run: RunResult): RunResult {
  return eachArray(run, plainArray);
}
