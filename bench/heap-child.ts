// One method's heap growth per step, in a process started with --expose-gc and a young
// generation large enough that no scavenge runs during a measured solve: the growth of the used
// heap is then what the solve allocated on the JavaScript heap. Two solves of different length
// are measured and the slope taken, so per-solve set-up (buffers, result objects) cancels out.
import { getHeapStatistics } from 'node:v8';
import { findMethod } from '../src/methods/registry.js';
import { findProblem } from '../problems/index.js';
import type { Setting } from '../src/core/types.js';

const [methodId, problemId, shortJson, longJson] = process.argv.slice(2);
const method = findMethod(methodId!)!;
// A long horizon (the span repeated 100 times) so even a high-order pair takes 1e5+ steps.
const base = findProblem(problemId!)!;
const problem = { ...base, tEnd: base.t0 + 100 * (base.tEnd - base.t0), checkTimes: [] as number[] };
const short = JSON.parse(shortJson!) as Setting;
const long = JSON.parse(longJson!) as Setting;
const gc = (globalThis as { gc?: () => void }).gc;
if (!gc) throw new Error('run with --expose-gc');
const options = { maxSteps: 50_000_000, checkTimes: problem.checkTimes };
// Warm up so compiled code (and its one-time allocations) is in place before measuring.
for (let k = 0; k < 3; k++) {
  method.solve(problem, short, options);
  method.solve(problem, long, options);
}
function grow(setting: Setting): { steps: number; bytes: number } {
  gc!();
  const before = getHeapStatistics().used_heap_size;
  const result = method.solve(problem, setting, options);
  const bytes = getHeapStatistics().used_heap_size - before;
  return { steps: result.counts.accepted + result.counts.rejected, bytes };
}
const a = grow(short);
const b = grow(long);
console.log(JSON.stringify({ method: methodId, problem: problemId, steps: b.steps, heapGrowthBytes: b.bytes, bytesPerStep: (b.bytes - a.bytes) / (b.steps - a.steps) }));
