// Ranking the candidates of `choose` and stating why one is recommended. By time, methods whose
// medians lie within each other's 95% margins are tied (timing noise cannot order them) and the
// tie is broken by function evaluations, which are exact; by evaluations, ranking is exact.
import type { Candidate, CostMeasure, ErrorMeasure } from './choose-types.js';

/** Lower and upper ends of a time's 95% interval (the median alone when its margin is unknown). */
function interval(c: Candidate): [number, number] {
  const t = c.cost ?? Infinity;
  const m = (c.timeMarginPercent ?? 0) / 100;
  return [t * (1 - m), t * (1 + m)];
}

const nfev = (c: Candidate): number => c.run?.counts.nfev ?? Infinity;

/**
 * Met candidates first, by cost (tied groups share a rank and are ordered by evaluations); then
 * the others by the best error they reached. A tie group starts at the fastest remaining method
 * and takes every method whose interval overlaps that method's.
 */
export function rankCandidates(candidates: readonly Candidate[], cost: CostMeasure): Candidate[] {
  const met = candidates.filter((c) => c.met).sort((a, b) => (a.cost ?? Infinity) - (b.cost ?? Infinity) || nfev(a) - nfev(b));
  const rest = candidates.filter((c) => !c.met).sort((a, b) => (a.achieved ?? Infinity) - (b.achieved ?? Infinity));
  const ranked: Candidate[] = [];
  let i = 0;
  while (i < met.length) {
    const lead = met[i]!;
    const [, leadHi] = interval(lead);
    let j = i + 1;
    if (cost === 'time') while (j < met.length && interval(met[j]!)[0] <= leadHi) j++;
    else while (j < met.length && met[j]!.cost === lead.cost) j++;
    const group = met.slice(i, j).sort((a, b) => nfev(a) - nfev(b));
    const rank = ranked.length + 1;
    for (const c of group) {
      ranked.push({ ...c, rank, tiedWith: group.filter((g) => g !== c).map((g) => g.method) });
    }
    i = j;
  }
  for (const c of rest) ranked.push({ ...c, rank: null, tiedWith: [] });
  return ranked;
}

function settingText(c: Candidate): string {
  const s = c.run?.setting;
  if (!s) return 'no setting';
  return 'rtol' in s ? `rtol ${s.rtol.toPrecision(3)}` : `${s.steps} equal steps`;
}

/**
 * The first ranked candidate whose error is monotone around its setting; a fragile one only when
 * every candidate that met the target is fragile (and then said).
 */
export function recommendation(
  ranked: readonly Candidate[],
  q: { target: number; safety: number; cost: CostMeasure; measure: ErrorMeasure },
): { recommended: Candidate | null; why: string } {
  const met = ranked.filter((c) => c.met);
  const need = `error (${q.measure}) at most ${(q.target / q.safety).toExponential(2)} (target ${q.target.toExponential(2)} / safety ${q.safety})`;
  if (met.length === 0) return { recommended: null, why: `no method reached ${need}; loosen the target, lower the safety factor, raise --max-steps or add methods` };
  const steady = met.find((c) => !c.neighbours?.fragile);
  const pick = steady ?? met[0]!;
  const costText = q.cost === 'time' ? 'median wall time (ties within the 95% margins broken by function evaluations)' : 'function evaluations';
  const parts = [`${pick.method} at ${settingText(pick)} reaches ${need} at the lowest ${costText}`];
  if (pick.tiedWith && pick.tiedWith.length > 0) {
    parts[0] =
      q.cost === 'time'
        ? `${pick.method} at ${settingText(pick)} reaches ${need}; its time is tied with ${pick.tiedWith.join(', ')} within the 95% margins and it needs the fewest function evaluations of them`
        : `${pick.method} at ${settingText(pick)} reaches ${need} with the fewest function evaluations, as many as ${pick.tiedWith.join(', ')} (listed first among equals)`;
  }
  if (pick !== met[0]) parts.push(`ranked ahead of it, ${met.slice(0, met.indexOf(pick)).map((c) => c.method).join(', ')} ${met.indexOf(pick) === 1 ? 'is' : 'are'} fragile (error not monotone at half and double the setting)`);
  if (!steady) parts.push('every method that met the target is fragile: its error is not monotone at the neighbouring settings, so treat this choice with care');
  if (pick.margin !== null) parts.push(`confirmed error ${pick.achieved?.toExponential(2)} is ${pick.margin.toPrecision(3)}x inside the target`);
  if (pick.neighbours) parts.push(pick.neighbours.summary);
  return { recommended: pick, why: `${parts.join('; ')}.` };
}
