// What a problem loaded from a user's file carries beyond the core Problem. These fields are
// optional for every other problem; consumers check for them.
import type { Problem, ProblemOutputs } from '../core/types.js';

export type { ProblemOutputs };

export interface UserProblemExtras {
  /** Where the Jacobian comes from: generated from the equations, or left to finite differences. */
  readonly jacobianSource: 'symbolic' | 'finite-difference';
  /** Why there is no analytic Jacobian, when jacobianSource is 'finite-difference'. */
  readonly jacobianNote?: string;
  readonly outputs?: ProblemOutputs;
  /**
   * What the error is measured on. 'outputs': apply outputs.fn to the computed and the reference
   * state and compare those (errorScale then applies per output component).
   */
  readonly errorOn: 'states' | 'outputs';
  /** Why no separable split exists (printed when a symplectic method is refused). */
  readonly separableReason?: string;
  /** The file the problem was loaded from. */
  readonly origin: string;
}

export type UserProblem = Problem & UserProblemExtras;
