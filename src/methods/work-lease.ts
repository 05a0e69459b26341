// Work buffers kept between solves. A solve asks for its vectors, matrices and row views one by
// one, in the same order every time; a lease hands back the arrays it handed out in the last
// solve of the same method and state size, zeroed, so a kept array gives bitwise the results of
// a fresh one (a sweep runs one method on one state size hundreds of times, and a fresh set costs
// microseconds, a few percent of a short solve). One lease per owner (a method's compiled tableau
// or stepper factory) and state size, lent to one solve at a time; a solve that starts while it
// is out (a model that itself integrates) gets a lease of its own.

/** Entry i of kept, zeroed, or a new array there when it is missing or of another length. */
function reuse<T extends Float64Array | Int32Array>(kept: T[], i: number, length: number, make: (length: number) => T): T {
  const a = kept[i];
  if (a && a.length === length) {
    a.fill(0);
    return a;
  }
  return (kept[i] = make(length));
}

export class WorkLease {
  private readonly floats: Float64Array[] = [];
  private readonly ints: Int32Array[] = [];
  private readonly views: Float64Array[][] = [];
  private nextFloat = 0;
  private nextInt = 0;
  private nextViews = 0;
  busy = false;

  /** A zeroed Float64Array of this length. */
  float64(length: number): Float64Array {
    return reuse(this.floats, this.nextFloat++, length, (l) => new Float64Array(l));
  }

  /** A Float64Array holding these values. */
  copyOf(values: ArrayLike<number>): Float64Array {
    const a = this.float64(values.length);
    for (let i = 0; i < values.length; i++) a[i] = values[i]!;
    return a;
  }

  /** A zeroed Int32Array of this length. */
  int32(length: number): Int32Array {
    return reuse(this.ints, this.nextInt++, length, (l) => new Int32Array(l));
  }

  /** Views of the `count` rows of `width` entries of matrix (row-major), kept with it. */
  rows(matrix: Float64Array, count: number, width: number): readonly Float64Array[] {
    const i = this.nextViews++;
    const kept = this.views[i];
    if (kept && kept.length === count && kept[0]?.buffer === matrix.buffer && kept[0].length === width) return kept;
    const out: Float64Array[] = [];
    for (let r = 0; r < count; r++) out.push(matrix.subarray(r * width, (r + 1) * width));
    return (this.views[i] = out);
  }

  release(): void {
    this.nextFloat = 0;
    this.nextInt = 0;
    this.nextViews = 0;
    this.busy = false;
  }
}

const kept = new WeakMap<object, WorkLease[]>();

/** The lease of `owner` for n states, or a fresh one while it is out. */
export function leaseFor(owner: object, n: number): WorkLease {
  let bySize = kept.get(owner);
  if (!bySize) kept.set(owner, (bySize = []));
  let lease = bySize[n];
  if (!lease) bySize[n] = lease = new WorkLease();
  else if (lease.busy) lease = new WorkLease();
  lease.busy = true;
  return lease;
}

/** Runs `use` on the lease of `owner` for n states, which is released however `use` ends. */
export function withLease<T>(owner: object, n: number, use: (lease: WorkLease) => T): T {
  const lease = leaseFor(owner, n);
  try {
    return use(lease);
  } finally {
    lease.release();
  }
}
