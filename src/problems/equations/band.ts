// The Jacobian band of an equation model, read from which states each equation depends on
// (through its definitions): lower = how far left of its own state an equation reaches, upper =
// how far right. Declared on the problem only when a band matrix would be narrower than the
// dense one, so implicit methods then factor band matrices (src/core/band-lu.ts).
import type { JacobianBand } from '../../core/types.js';
import { bandWidth } from '../../core/band-lu.js';

export function detectedBand(deps: readonly ReadonlySet<number>[]): JacobianBand | undefined {
  const n = deps.length;
  let lower = 0;
  let upper = 0;
  deps.forEach((states, i) => {
    for (const j of states) {
      if (i - j > lower) lower = i - j;
      if (j - i > upper) upper = j - i;
    }
  });
  return bandWidth(lower, upper) < n ? { lower, upper } : undefined;
}
