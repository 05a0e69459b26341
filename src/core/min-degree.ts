// Fill-reducing order for sparse LU: minimum degree on the graph of A + A^T (Tinney and Walker,
// "Direct solutions of sparse network equations by optimally ordered triangular factorization",
// Proc. IEEE 55 (1967) 1801-1809, their scheme 2; George and Liu, "The evolution of the minimum
// degree ordering algorithm", SIAM Review 31 (1989) 1-19). Plain form on the explicit elimination
// graph: eliminate a node of least degree (lowest index on ties, so the order is deterministic),
// join its neighbours into a clique, repeat. Computed once per pattern (src/core/sparse-lu.ts),
// so the quadratic scan for the least degree is affordable at the sizes here (thousands of states).
import type { SparsePattern } from './sparse-pattern.js';

export interface EliminationOrder {
  /** order[k] = the state eliminated k-th. */
  readonly order: Int32Array;
  /**
   * Entries of L below the diagonal (and of U above it) when every pivot is on the diagonal:
   * the sum of the degrees at elimination. Sizes the factors' storage.
   */
  readonly offDiagonal: number;
}

export function minimumDegreeOrder(p: SparsePattern): EliminationOrder {
  const n = p.n;
  const adj: Set<number>[] = Array.from({ length: n }, () => new Set<number>());
  for (let i = 0; i < n; i++) {
    for (let q = p.rowStart[i]!; q < p.rowStart[i + 1]!; q++) {
      const j = p.column[q]!;
      if (j !== i) {
        adj[i]!.add(j);
        adj[j]!.add(i);
      }
    }
  }
  const done = new Uint8Array(n);
  const order = new Int32Array(n);
  let offDiagonal = 0;
  for (let k = 0; k < n; k++) {
    let best = -1;
    let bestDegree = Infinity;
    for (let v = 0; v < n; v++) {
      if (!done[v] && adj[v]!.size < bestDegree) {
        best = v;
        bestDegree = adj[v]!.size;
      }
    }
    order[k] = best;
    offDiagonal += bestDegree;
    done[best] = 1;
    const nbrs = [...adj[best]!];
    for (const u of nbrs) adj[u]!.delete(best);
    for (let a = 0; a < nbrs.length; a++) {
      const su = adj[nbrs[a]!]!;
      for (let b = 0; b < nbrs.length; b++) if (a !== b) su.add(nbrs[b]!);
    }
    adj[best]!.clear();
  }
  return { order, offDiagonal };
}
