// Which structure a solve gives its Jacobian and iteration matrices: dense, a band
// (src/core/band-lu.ts) or a sparse pattern (src/core/sparse-lu.ts). A declared pattern is used
// when the problem is not small and the pattern stores far fewer entries than the band (or the
// dense matrix) would; otherwise a declared band when it is narrower than the matrix; otherwise
// dense. The pattern's compressed forms, column groups and LU analysis are made once per
// declared pattern and shared by every solve of it.
import { bandWidth } from './band-lu.js';
import { columnGroups, type ColumnGroups } from './column-groups.js';
import { InputError } from './errors.js';
import { SparseLuAnalysis } from './sparse-lu.js';
import { patternProblem, SparsePattern } from './sparse-pattern.js';
import type { JacobianBand, JacobianPattern } from './types.js';

/**
 * Below this many states a declared pattern is not used: dense (or band) LU on a small matrix
 * costs less than the sparse bookkeeping (common practice, no source).
 */
export const SPARSE_MIN_STATES = 32;
/**
 * A pattern is used only when the band (or dense) storage holds at least this many times its
 * entries: sparse LU spends several times more per flop than the band's contiguous loops
 * (common practice, no source).
 */
export const SPARSE_ADVANTAGE = 4;

/** A pattern ready for solves: compressed, its columns grouped, its LU analysed (on first use). */
export class SparseJacobian {
  readonly groups: ColumnGroups;
  private analysed: SparseLuAnalysis | null = null;

  constructor(readonly pattern: SparsePattern) {
    this.groups = columnGroups(pattern);
  }

  get analysis(): SparseLuAnalysis {
    return (this.analysed ??= new SparseLuAnalysis(this.pattern));
  }
}

const prepared = new WeakMap<JacobianPattern, SparseJacobian>();

/** The prepared form of a declared pattern (validated; InputError naming `jacobianPattern` otherwise). */
export function sparseJacobian(pattern: JacobianPattern, n: number): SparseJacobian {
  const kept = prepared.get(pattern);
  if (kept && kept.pattern.n === n) return kept;
  const wrong = patternProblem(pattern, n, 'jacobianPattern');
  if (wrong) throw new InputError(wrong);
  const made = new SparseJacobian(new SparsePattern(n, pattern));
  prepared.set(pattern, made);
  return made;
}

/** The band a solve should use: only when it is narrower than the matrix (a band as wide as n saves nothing). */
export function usefulBand(band: JacobianBand | undefined, n: number): JacobianBand | null {
  if (!band) return null;
  return bandWidth(band.lower, band.upper) < n ? band : null;
}

/** The structure for a solve of a problem with these declarations (see the header). */
export function jacobianStructure(
  problem: { readonly jacobianBand?: JacobianBand | undefined; readonly jacobianPattern?: JacobianPattern | undefined },
  n: number,
): JacobianBand | SparseJacobian | null {
  const band = usefulBand(problem.jacobianBand, n);
  if (problem.jacobianPattern && n >= SPARSE_MIN_STATES) {
    const sparse = sparseJacobian(problem.jacobianPattern, n);
    const stored = band ? n * bandWidth(band.lower, band.upper) : n * n;
    if (sparse.pattern.nnz * SPARSE_ADVANTAGE <= stored) return sparse;
  }
  return band;
}
