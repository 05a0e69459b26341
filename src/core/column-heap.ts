// A binary heap over columns 0..n-1 whose keys change while it is in use, for the column
// orderings (src/core/column-orderings.ts). The first column is the one with the largest key,
// ties going to the larger `tie`, then to the smaller index, so every ordering is deterministic.
// O(log n) per key change, O(n) memory.
export class ColumnHeap {
  private readonly heap: Int32Array;
  /** Place of each column in `heap`, -1 once taken out. */
  private readonly place: Int32Array;
  private size: number;

  /** `key` may be changed between calls, through `raised` or `lowered` only; `tie` never changes. */
  constructor(
    readonly key: Int32Array,
    private readonly tie: Int32Array,
  ) {
    const n = key.length;
    this.heap = new Int32Array(n);
    this.place = new Int32Array(n);
    for (let j = 0; j < n; j++) this.heap[j] = this.place[j] = j;
    this.size = n;
    for (let s = (n >> 1) - 1; s >= 0; s--) this.down(s);
  }

  has(j: number): boolean {
    return this.place[j]! >= 0;
  }

  /** Takes the first column out (the heap must not be empty). */
  pop(): number {
    const top = this.heap[0]!;
    this.place[top] = -1;
    const last = this.heap[--this.size]!;
    if (this.size > 0) {
      this.heap[0] = last;
      this.place[last] = 0;
      this.down(0);
    }
    return top;
  }

  /** Column j's key went up. */
  raised(j: number): void {
    this.up(this.place[j]!);
  }

  /** Column j's key went down. */
  lowered(j: number): void {
    this.down(this.place[j]!);
  }

  private before(a: number, b: number): boolean {
    const ka = this.key[a]!;
    const kb = this.key[b]!;
    if (ka !== kb) return ka > kb;
    const ta = this.tie[a]!;
    const tb = this.tie[b]!;
    return ta !== tb ? ta > tb : a < b;
  }

  private up(s: number): void {
    const heap = this.heap;
    const j = heap[s]!;
    while (s > 0) {
      const parent = (s - 1) >> 1;
      const pj = heap[parent]!;
      if (!this.before(j, pj)) break;
      heap[s] = pj;
      this.place[pj] = s;
      s = parent;
    }
    heap[s] = j;
    this.place[j] = s;
  }

  private down(s: number): void {
    const heap = this.heap;
    const j = heap[s]!;
    for (;;) {
      let child = 2 * s + 1;
      if (child >= this.size) break;
      if (child + 1 < this.size && this.before(heap[child + 1]!, heap[child]!)) child++;
      const cj = heap[child]!;
      if (!this.before(cj, j)) break;
      heap[s] = cj;
      this.place[cj] = s;
      s = child;
    }
    heap[s] = j;
    this.place[j] = s;
  }
}
