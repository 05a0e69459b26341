// The Jacobian pattern of an equation model: row i lists the states equation i depends on
// (through its definitions), the same dependencies the band is read from (band.ts). Declared on
// the problem only when some entry is structurally zero; the solve then takes band, sparse or
// dense by src/core/jacobian-structure.ts (sparse when the pattern is much sparser than the band).
import type { JacobianPattern } from '../../core/types.js';

export function detectedPattern(deps: readonly ReadonlySet<number>[]): JacobianPattern | undefined {
  const n = deps.length;
  const rows = deps.map((states) => [...states].sort((a, b) => a - b));
  const entries = rows.reduce((sum, row) => sum + row.length, 0);
  return entries < n * n ? rows : undefined;
}
