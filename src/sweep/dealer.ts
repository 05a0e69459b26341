// Which run a parallel sweep's worker (a lane) gets next. V8 compiles each method's step code and
// each problem's right-hand side per process, and the catalogue's runs take milliseconds, so a
// schedule that deals single runs, or even (problem, method) groups, pays most of that warm-up in
// every worker (measured on the catalogue: the workers' summed run time fell from 6.7 to about
// 5.9 s when they took whole methods; bench/README.md). A lane therefore claims a whole method's runs,
// ordered problem by problem, costliest method first, and works through them. A lane that finds
// nothing left to claim takes the back half of the largest remaining claim, so one method's sweep
// (or one method that outweighs the rest) still spreads over every lane, and an expected cost
// that was badly wrong costs at most the tail of one claim.
import type { PlannedRun } from './plan.js';
import { costOf } from './shard.js';

/** Runs of one method, problem by problem (costliest problem first), costliest run first within a problem. */
export interface RunGroup {
  method: string;
  runs: PlannedRun[];
  cost: number;
}

function byCostThenPlan<T extends { cost: number; first: number }>(a: T, b: T): number {
  return b.cost - a.cost || a.first - b.first;
}

/** The runs grouped by method, in the order a lane works through them; a pure function of the plan. */
export function methodGroups(runs: readonly PlannedRun[]): RunGroup[] {
  const byMethod = new Map<string, Map<string, PlannedRun[]>>();
  for (const r of runs) {
    let problems = byMethod.get(r.method);
    if (!problems) byMethod.set(r.method, (problems = new Map()));
    const list = problems.get(r.problem);
    if (list) list.push(r);
    else problems.set(r.problem, [r]);
  }
  const groups: (RunGroup & { first: number })[] = [];
  for (const [method, problems] of byMethod) {
    const parts = [...problems.values()].map((list) => {
      list.sort((a, b) => costOf(b) - costOf(a) || a.planIndex - b.planIndex);
      return { list, cost: list.reduce((s, r) => s + costOf(r), 0), first: list.reduce((m, r) => Math.min(m, r.planIndex), Infinity) };
    });
    parts.sort(byCostThenPlan);
    const cost = parts.reduce((s, p) => s + p.cost, 0);
    groups.push({ method, runs: parts.flatMap((p) => p.list), cost, first: parts.reduce((m, p) => Math.min(m, p.first), Infinity) });
  }
  groups.sort(byCostThenPlan);
  return groups.map(({ method, runs: list, cost }) => ({ method, runs: list, cost }));
}

/** A lane's claim: runs[from..to) are still to be dealt. */
interface Claim {
  runs: PlannedRun[];
  from: number;
  to: number;
}

/**
 * Deals runs to `lanes` lanes on request. Single-threaded (the main process's event loop), so a
 * call is atomic; which lane runs what depends on timing, never what a run computes.
 */
export class RunDealer {
  private readonly groups: RunGroup[];
  private nextGroup = 0;
  private readonly claims: Claim[];

  constructor(runs: readonly PlannedRun[], lanes: number) {
    this.groups = methodGroups(runs);
    this.claims = Array.from({ length: Math.max(1, lanes) }, () => ({ runs: [], from: 0, to: 0 }));
  }

  /** The next run for `lane`, or undefined when every run has been dealt. */
  next(lane: number): PlannedRun | undefined {
    const claim = this.claims[lane]!;
    if (claim.from === claim.to && !this.claimGroup(claim) && !this.stealFor(claim)) return undefined;
    return claim.runs[claim.from++];
  }

  private claimGroup(claim: Claim): boolean {
    const group = this.groups[this.nextGroup];
    if (!group) return false;
    this.nextGroup++;
    claim.runs = group.runs;
    claim.from = 0;
    claim.to = group.runs.length;
    return true;
  }

  /** Takes the back half of the claim with the most runs left (ties: the lowest lane). */
  private stealFor(claim: Claim): boolean {
    let victim: Claim | undefined;
    for (const c of this.claims) if (c !== claim && c.to - c.from >= 2 && (!victim || c.to - c.from > victim.to - victim.from)) victim = c;
    if (!victim) return false;
    const split = victim.from + Math.ceil((victim.to - victim.from) / 2);
    claim.runs = victim.runs;
    claim.from = split;
    claim.to = victim.to;
    victim.to = split;
    return true;
  }
}
