// Turns a `choose` result into the decision record (src/report/decision-record.ts): the question,
// the model and its hash, the reference and who made it, every candidate and the verdict.
import type { ControllerKind, Problem } from '../core/types.js';
import type { Environment } from '../results/contract.js';
import { sha256 } from '../core/hash.js';
import { measureUnit } from '../measure/run-measures.js';
import { DEFAULT_SAFETY } from '../core/defaults.js';
import { CAUTION_TEXT } from '../report/caution.js';
import { DECISION_FORMAT, DECISION_VERSION, type DecisionCandidate, type DecisionRecord, type DecisionReference } from '../report/decision-record.js';
import type { Candidate, Choice } from '../sweep/choose.js';

/** Why the default safety factor of `choose` is what it is (said in every record). */
export const SAFETY_NOTE =
  `The default is ${DEFAULT_SAFETY}: the search stops where the error meets what it asks for, and doubling an adaptive ` +
  'method\'s tolerance (the looser neighbour the fragility check tries) roughly doubles its error, so a factor of 2 keeps ' +
  'that neighbour within the target too. Use --safety 1 for the bare boundary, more for headroom against changes to the model.';

export function referenceRecord(p: Problem): DecisionReference {
  const ref = p.reference;
  const certifying = ref.certifiedBy ? [...ref.certifiedBy.methods] : [];
  let trust: string;
  if (ref.unavailable) trust = 'none: no reference could be had';
  else if (ref.kind === 'exact') trust = ref.digits === undefined ? 'exact formula: errors are resolved down to round-off' : `exact formula evaluated numerically, ${ref.digits} digits`;
  else if (ref.kind === 'published') trust = ref.digits === undefined ? 'published values (digits not stated)' : `published values with ${ref.digits} significant digits`;
  else trust = ref.digits === undefined ? 'certified (agreement not recorded)' : `certified: ${certifying.join(' and ')}${ref.certifiedBy?.rtol === undefined ? '' : ` at rtol ${ref.certifiedBy.rtol}`} agree to ${ref.digits} digits; errors below that are not resolved`;
  const out: DecisionReference = { kind: ref.kind, source: ref.source ?? null, digits: ref.digits ?? null, trust, certifyingMethods: certifying };
  if (ref.unavailable) out.unavailable = ref.unavailable;
  return out;
}

function candidateRecord(c: Candidate): DecisionCandidate {
  const run = c.run;
  return {
    rank: c.rank ?? null,
    method: c.method,
    family: c.family,
    met: c.met,
    setting: run?.setting ?? null,
    status: run?.status ?? null,
    achieved: c.achieved,
    margin: c.margin,
    counts: run ? { ...run.counts } : null,
    time: run ? { medianSeconds: run.time.medianSeconds, marginPercent: c.timeMarginPercent ?? null, samples: run.time.samples } : null,
    tiedWith: c.tiedWith ?? [],
    fragile: c.neighbours ? c.neighbours.fragile : null,
    neighbours: c.neighbours ? [c.neighbours.looser, c.neighbours.tighter] : [],
    trials: c.trials,
    notes: [...(c.note ? [c.note] : []), ...(run?.effectiveTolerance ? [`the method controls to rtol ${run.effectiveTolerance.rtol.toPrecision(3)} after its internal tolerance map`] : []), ...(c.neighbours && !c.neighbours.fragile ? [c.neighbours.summary] : []), ...(run?.message ? [run.message] : [])],
    tried: c.tried ?? [],
  };
}

export function decisionRecord(
  choice: Choice,
  problem: Problem,
  context: { environment: Environment; commandLine: string; maxSteps: number; controller: ControllerKind; createdAt?: string },
): DecisionRecord {
  const rec = choice.recommended;
  return {
    format: DECISION_FORMAT,
    version: DECISION_VERSION,
    createdAt: context.createdAt ?? new Date().toISOString(),
    question: {
      problem: choice.problem,
      target: choice.target,
      measure: choice.measure,
      unit: measureUnit(problem, choice.measure),
      cost: choice.cost,
      safety: choice.safety,
      required: choice.required,
      maxSteps: context.maxSteps,
      controller: context.controller,
    },
    model: {
      id: problem.id,
      title: problem.title,
      source: problem.source,
      stiff: problem.stiff,
      dimension: problem.dimension,
      definition: problem.definition,
      sha256: sha256(problem.definition),
    },
    reference: referenceRecord(problem),
    candidates: choice.candidates.map(candidateRecord),
    recommendation: rec && rec.run
      ? { method: rec.method, setting: rec.run.setting, achieved: rec.achieved, margin: rec.margin, fragile: rec.neighbours ? rec.neighbours.fragile : null }
      : null,
    why: choice.why,
    safetyNote: SAFETY_NOTE,
    environment: context.environment,
    commandLine: context.commandLine,
    caution: CAUTION_TEXT,
  };
}
