// Which run a parallel sweep's worker (a lane) gets next, and the order a sweep on one process
// runs in. V8 compiles each method's step code and each problem's right-hand side per process, and
// the catalogue's runs take milliseconds, so a schedule that deals single runs, or even (problem,
// method) groups, pays most of that warm-up in every worker. A lane therefore claims a whole
// method's runs, costliest method first, and works through them in plan order: problem by problem,
// each problem's settings from the loosest (cheapest) up (both measured: bench/README.md, "History
// kept out of the code"). A lane that finds nothing left to claim takes the back half of the
// largest remaining claim, so one method's sweep (or one method that outweighs the rest) still
// spreads over every lane, and an expected cost that was badly wrong costs at most the tail of one
// claim.
import type { PlannedRun } from './plan.js';
import { costOf } from './shard.js';

/** Runs of one method in plan order: problem by problem, each problem's settings as planned. */
export interface RunGroup {
  method: string;
  runs: PlannedRun[];
  cost: number;
}

function byCostThenPlan<T extends { cost: number; first: number }>(a: T, b: T): number {
  return b.cost - a.cost || a.first - b.first;
}

/** The runs grouped by method, costliest method first; a pure function of the plan. */
export function methodGroups(runs: readonly PlannedRun[]): RunGroup[] {
  const byMethod = new Map<string, PlannedRun[]>();
  for (const r of runs) {
    const list = byMethod.get(r.method);
    if (list) list.push(r);
    else byMethod.set(r.method, [r]);
  }
  const groups: (RunGroup & { first: number })[] = [];
  for (const [method, list] of byMethod) {
    // Problems in the order they first appear in the plan, each problem's runs in plan order:
    // for a plan (problem-major) that is plain plan order.
    const firstOf = new Map<string, number>();
    for (const r of list) firstOf.set(r.problem, Math.min(firstOf.get(r.problem) ?? Infinity, r.planIndex));
    list.sort((a, b) => firstOf.get(a.problem)! - firstOf.get(b.problem)! || a.planIndex - b.planIndex);
    groups.push({ method, runs: list, cost: list.reduce((s, r) => s + costOf(r), 0), first: list[0]!.planIndex });
  }
  groups.sort(byCostThenPlan);
  return groups.map(({ method, runs: list, cost }) => ({ method, runs: list, cost }));
}

/** The order a sweep on one process runs in: the groups one after another (see the header). */
export function executionOrder(runs: readonly PlannedRun[]): PlannedRun[] {
  return methodGroups(runs).flatMap((g) => g.runs);
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

  /**
   * Up to `max` runs for `lane` to send together: the next run as `next` deals it, then the
   * following runs of the same claim (never a new claim or a steal). Empty when all are dealt.
   */
  take(lane: number, max: number): PlannedRun[] {
    const first = this.next(lane);
    if (!first) return [];
    const claim = this.claims[lane]!;
    const end = Math.min(claim.to, claim.from + Math.max(0, max - 1));
    const out = [first, ...claim.runs.slice(claim.from, end)];
    claim.from = end;
    return out;
  }

  /**
   * Runs dealt to `lane` but not started (a batch its worker stopped early) go back to the front
   * of its claim, in order, where the lane takes them next and an idle lane can still steal them.
   */
  giveBack(lane: number, runs: readonly PlannedRun[]): void {
    if (runs.length === 0) return;
    const claim = this.claims[lane]!;
    // A copy: a steal may share the old array with another lane's claim.
    claim.runs = [...runs, ...claim.runs.slice(claim.from, claim.to)];
    claim.from = 0;
    claim.to = claim.runs.length;
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
