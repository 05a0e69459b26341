// The shapes `choose` works with and answers in: options, candidates, the choice.
import type { RunOptions } from '../measure/run-one.js';
import type { TimingOptions } from '../measure/timing.js';
import type { RunResult, RunSetting } from '../results/contract.js';
import type { NeighbourCheck } from './choose-neighbours.js';

import type { ErrorMeasure } from '../measure/run-measures.js';
import type { FixedCandidate, StepCost } from './fixed-rates.js';

export type { ErrorMeasure } from '../measure/run-measures.js';
export type CostMeasure = 'nfev' | 'time';

export interface ChooseOptions extends RunOptions {
  target: number;
  /** Error must be at most target / safety (1: on the target itself). */
  safety?: number;
  /** --atol: one value or one per state, with every rtol tried. */
  atol?: number | readonly number[];
  measure: ErrorMeasure;
  cost: CostMeasure;
  timing: TimingOptions;
  /** Fixed-step candidates (rates or step sizes), fewest steps first; tried in order instead of the doubling search. */
  fixedCandidates?: readonly FixedCandidate[];
}

export interface Candidate {
  method: string;
  family: string;
  met: boolean;
  /** The confirmed run at the chosen setting (or the most accurate run tried when not met). */
  run: RunResult | null;
  achieved: number | null;
  /** target / achieved: how far inside the target the confirmed error is. */
  margin: number | null;
  cost: number | null;
  /** Solves spent searching (for the record). */
  trials: number;
  note?: string;
  /** Every setting tried by the search, in order (the decision record's plot draws them). */
  tried?: TrialPoint[];
  /** 95% relative margin of the confirmed run's median time, percent (null: not timed). */
  timeMarginPercent?: number | null;
  /** Rank among the candidates that met the target; tied candidates share one. */
  rank?: number | null;
  /** Candidates whose times overlap this one's within their 95% margins (ranked by evaluations). */
  tiedWith?: string[];
  /** The chosen setting's neighbours and whether the error is monotone across them. */
  neighbours?: NeighbourCheck;
  /** The rate of the chosen fixed-step candidate, Hz (when candidates were given as rates). */
  rateHz?: number | null;
  /** Cost of one step at the chosen fixed-step setting: the most and the mean evaluations, and mean seconds. */
  stepCost?: (StepCost & { meanSeconds: number | null }) | null;
}

/** One solve of the search, kept small: the setting, its error and work. */
export interface TrialPoint {
  setting: RunSetting;
  status: RunResult['status'];
  error: number | null;
  nfev: number;
}

export interface Choice {
  problem: string;
  target: number;
  /** The safety factor asked for; candidates had to reach target / safety. */
  safety: number;
  /** target / safety: the error each candidate had to reach. */
  required: number;
  measure: ErrorMeasure;
  cost: CostMeasure;
  candidates: Candidate[];
  recommended: Candidate | null;
  /** Why the recommended candidate (or why none). */
  why: string;
  /** Why nothing was tried: no reference, or one with too few trusted digits (acceptance.ts). */
  refused?: string;
}

