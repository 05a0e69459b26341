// The stiffness ratio of a problem along its reference trajectory: at the start and at every
// time where the reference gives the state (check times for analytic references, the tabulated
// points otherwise). Large problems keep the figure in stepgauge's cache (see STIFFNESS_CACHE_FROM),
// except a dispersion's samples.
import { existsSync, mkdirSync, readFileSync, renameSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import type { Problem } from '../core/types.js';
import { sha256Parts } from '../core/hash.js';
import { cacheDir } from './certify.js';
import { stiffnessRatio } from './stiffness.js';

/**
 * Problems with at least this many states have their ratio cached: the dense eigenvalues cost
 * O(n^3) per state (brusselator-1d, 1000 states at 11 reference states, took 39 s in every sweep
 * and every `stepgauge list`), while a small problem's ratio costs less than reading a file.
 * The threshold is common practice, no source.
 */
export const STIFFNESS_CACHE_FROM = 200;
/** Raised whenever the way the ratio is computed changes, so older cache entries are not read. */
const RECIPE = 1;

interface CachedRatio {
  recipe: number;
  ratio: number | null;
}

export function problemStiffnessRatio(problem: Problem): number | null {
  const times: number[] = [problem.t0];
  const states: number[][] = [[...problem.y0]];
  const ref = problem.reference;
  if (ref.exact) {
    const out = new Float64Array(problem.dimension);
    for (const t of [...problem.checkTimes, problem.tEnd]) {
      ref.exact(t, out);
      times.push(t);
      states.push(Array.from(out));
    }
  } else {
    for (const p of ref.points ?? []) {
      times.push(p.t);
      states.push([...p.y]);
    }
  }
  const compute = (): number | null => {
    try {
      const { max } = stiffnessRatio(problem, times, states);
      return Number.isFinite(max) ? max : null;
    } catch {
      return null;
    }
  };
  // A dispersion's samples stay out: one file each would grow the cache with the sample count.
  if (problem.dimension < STIFFNESS_CACHE_FROM || problem.dispersion) return compute();
  // Keyed by everything the figure depends on: the definition (its sources' hashes included)
  // and the states the Jacobian is taken at (a certified reference's come from its own cache).
  const key = sha256Parts([String(RECIPE), '\n', problem.definition, '\n', JSON.stringify(times), '\n', ...states.map((s) => s.join(',') + '\n')]);
  const file = join(cacheDir(), `stiffness-${key}.json`);
  if (existsSync(file)) {
    try {
      const cached = JSON.parse(readFileSync(file, 'utf8')) as CachedRatio;
      if (cached.recipe === RECIPE && (cached.ratio === null || typeof cached.ratio === 'number')) return cached.ratio;
    } catch {
      // a damaged entry is computed again
    }
  }
  const ratio = compute();
  try {
    mkdirSync(cacheDir(), { recursive: true });
    const tmp = `${file}.${process.pid}.tmp`;
    writeFileSync(tmp, JSON.stringify({ recipe: RECIPE, ratio } satisfies CachedRatio));
    renameSync(tmp, file);
  } catch {
    // an unwritable cache costs the next sweep the computation, nothing else
  }
  return ratio;
}
