// Work buffers of the implicit steppers, kept between solves. A stepper asks for its vectors and
// matrices one by one, in the same order every solve; a lease hands back the arrays it handed out
// in the last solve of the same method and state size, zeroed, so a kept array gives bitwise the
// results of a fresh one. One lease per method and state size, lent to one solve at a time; a
// solve that starts while it is out (a model that itself integrates) gets a lease of its own.

export class WorkLease {
  private readonly floats: Float64Array[] = [];
  private readonly ints: Int32Array[] = [];
  private nextFloat = 0;
  private nextInt = 0;
  busy = false;

  /** A zeroed Float64Array of this length. */
  float64(length: number): Float64Array {
    let a = this.floats[this.nextFloat];
    if (a && a.length === length) a.fill(0);
    else this.floats[this.nextFloat] = a = new Float64Array(length);
    this.nextFloat++;
    return a;
  }

  /** A Float64Array holding these values. */
  copyOf(values: ArrayLike<number>): Float64Array {
    const a = this.float64(values.length);
    for (let i = 0; i < values.length; i++) a[i] = values[i]!;
    return a;
  }

  /** A zeroed Int32Array of this length. */
  int32(length: number): Int32Array {
    let a = this.ints[this.nextInt];
    if (a && a.length === length) a.fill(0);
    else this.ints[this.nextInt] = a = new Int32Array(length);
    this.nextInt++;
    return a;
  }

  release(): void {
    this.nextFloat = 0;
    this.nextInt = 0;
    this.busy = false;
  }
}

const kept = new WeakMap<object, WorkLease[]>();

/** The lease of `owner` (a method's stepper factory) for n states, or a fresh one while it is out. */
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
