// Work buffers of the explicit Runge-Kutta engines, kept between solves. A sweep runs the same
// method on the same state size hundreds of times, and a fresh set (the stage buffer, its row
// views, two states, the stage state, the scalar buffer) costs about 2 us to allocate on the
// development machine, a few percent of a short solve. One set is kept per compiled tableau and
// state size and lent to one solve at a time; a solve that starts while it is out (a model or an
// observer that itself integrates) gets a set of its own. A set comes back zeroed and with y0 in
// place, so a lent set gives bitwise the results of a fresh one.
import { IO_SIZE, type Tableau } from './tableau.js';

export interface ExplicitWork {
  /** Stage derivatives, row-major: stage i at K[i*n .. i*n + n). */
  readonly K: Float64Array;
  /** Row views of K. */
  readonly kRow: readonly Float64Array[];
  readonly y: Float64Array;
  readonly yNew: Float64Array;
  readonly yStage: Float64Array;
  /** The scalar buffer a stage kernel reads its step from (slots IO_* of tableau.ts). */
  readonly io: Float64Array;
  /** Set while a solve holds the set. */
  busy: boolean;
}

const kept = new WeakMap<Tableau, (ExplicitWork | undefined)[]>();

function freshWork(stages: number, n: number): ExplicitWork {
  const K = new Float64Array(stages * n);
  const kRow: Float64Array[] = [];
  for (let i = 0; i < stages; i++) kRow.push(K.subarray(i * n, (i + 1) * n));
  return { K, kRow, y: new Float64Array(n), yNew: new Float64Array(n), yStage: new Float64Array(n), io: new Float64Array(IO_SIZE), busy: false };
}

/** A zeroed set for one solve of `tab` on n states, with y0 copied into y; give it back with returnWork. */
export function borrowWork(tab: Tableau, n: number, y0: readonly number[]): ExplicitWork {
  let bySize = kept.get(tab);
  if (!bySize) kept.set(tab, (bySize = []));
  let work = bySize[n];
  if (!work || work.busy) {
    work = freshWork(tab.stages, n);
    if (!bySize[n]) bySize[n] = work;
  } else {
    work.K.fill(0);
    work.yNew.fill(0);
    work.yStage.fill(0);
    work.io.fill(0);
  }
  for (let i = 0; i < n; i++) work.y[i] = y0[i]!;
  work.busy = true;
  return work;
}

export function returnWork(work: ExplicitWork): void {
  work.busy = false;
}

/** Runs `solve` on a lent set, which comes back however the solve ends (a throwing model too). */
export function withWork<T>(tab: Tableau, n: number, y0: readonly number[], solve: (work: ExplicitWork) => T): T {
  const work = borrowWork(tab, n, y0);
  try {
    return solve(work);
  } finally {
    returnWork(work);
  }
}
