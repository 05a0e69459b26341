// The decision record `choose --out` writes: plain data (decision.json), so the Markdown and HTML
// renderings and any later reader see the same facts. Format "stepgauge-decision", version 1.
import type { Counts, ReferenceKind, Status } from '../core/types.js';
import type { Environment, RunSetting } from '../results/contract.js';

export const DECISION_FORMAT = 'stepgauge-decision';
export const DECISION_VERSION = 1;

export interface DecisionQuestion {
  problem: string;
  /** Largest acceptable error, in the problem's error scale. */
  target: number;
  /** final (end of the span) or max (over the check times). */
  measure: string;
  /** Unit of the measure ('' for the problem's own error scale). */
  unit: string;
  /** time (median wall time) or nfev (function evaluations). */
  cost: 'time' | 'nfev';
  /** Candidates had to reach target / safety. */
  safety: number;
  required: number;
  maxSteps: number;
  /** Step-size controller of the explicit pairs (standard, pi or deadband); absent in older records. */
  controller?: string;
}

export interface DecisionModel {
  id: string;
  title: string;
  source: string;
  stiff: boolean;
  dimension: number;
  /** The canonical definition text, and the SHA-256 of exactly that text. */
  definition: string;
  sha256: string;
}

export interface DecisionReference {
  kind: ReferenceKind;
  source: string | null;
  /** Trusted significant digits (null: exact to round-off). */
  digits: number | null;
  /** In words: how far the reference can be trusted. */
  trust: string;
  /** Methods whose agreement made a certified reference (empty for exact and published ones). */
  certifyingMethods: string[];
  /** Set when no reference could be had. */
  unavailable?: string;
}

export interface DecisionTrial {
  setting: RunSetting;
  status: Status;
  error: number | null;
  nfev: number;
}

export interface DecisionCandidate {
  /** Shared by tied candidates; null for those that did not meet the target. */
  rank: number | null;
  method: string;
  family: string;
  met: boolean;
  setting: RunSetting | null;
  status: Status | null;
  achieved: number | null;
  /** target / achieved. */
  margin: number | null;
  counts: Counts | null;
  time: { medianSeconds: number | null; marginPercent: number | null; samples: number } | null;
  tiedWith: string[];
  fragile: boolean | null;
  neighbours: { side: 'tighter' | 'looser'; setting: RunSetting; status: Status; error: number | null }[];
  /** Solves the search spent. */
  trials: number;
  notes: string[];
  tried: DecisionTrial[];
}

export interface DecisionRecord {
  format: typeof DECISION_FORMAT;
  version: typeof DECISION_VERSION;
  createdAt: string;
  question: DecisionQuestion;
  model: DecisionModel;
  reference: DecisionReference;
  candidates: DecisionCandidate[];
  recommendation: { method: string; setting: RunSetting; achieved: number | null; margin: number | null; fragile: boolean | null } | null;
  why: string;
  /** The safety factor's default and the reason for it. */
  safetyNote: string;
  environment: Environment;
  commandLine: string;
  caution: string;
}
