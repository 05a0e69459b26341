// Watching a run for event crossings: a sign change of g(t, y) in the event's direction from one
// accepted step to the next, located with a bracketing root finder (Illinois) on an interpolant
// of that step. Two interpolants:
// - the method's own continuous extension, handed to the step hook (dormand-prince-54's), where
//   the method has one: no right-hand-side evaluations at all;
// - otherwise stepgauge's two-point Hermite of the accepted steps (src/measure/hermite.ts), built
//   from the run's states and three right-hand-side evaluations per accepted step, made here and
//   counted as the measurement's (`evaluations`), never as the method's.
// A step that jumps over an even number of crossings (a short eclipse) sees no sign change and
// the crossings are missed, as they would be by any integrator that tests for events only at its
// steps.
import type { EventDirection, Problem } from '../core/types.js';
import { illinoisRoot } from '../core/root.js';
import { hermiteAt, secondDerivative, type StepEnds } from './hermite.js';
import type { StepInterpolant } from './output-times.js';

/** Root-finding tolerance in time, relative to the span's time scale (|t| or the step). */
export const ROOT_REL_TOL = 4 * Number.EPSILON;
export const HERMITE_EVENT_INTERPOLANT =
  "stepgauge's two-point Hermite of the accepted steps (degree 5; degree 7 on an orbit's position), from the run's states and 3 right-hand-side evaluations per step outside the method's counts";

export interface EventWatch {
  observe(t: number, y: Float64Array): void;
  /** Sees every accepted step with the method's own interpolant (watchers made with `method`). */
  step(tOld: number, tNew: number, evaluate: StepInterpolant): void;
  /** Crossing times found so far, by event name. */
  found(): Record<string, number[]>;
  /** Right-hand-side evaluations the watcher made (0 on the method's own interpolant). */
  evaluations(): number;
}

export function crosses(direction: EventDirection, ga: number, gb: number): boolean {
  const rising = ga < 0 && gb >= 0;
  const falling = ga > 0 && gb <= 0;
  return direction === 'rising' ? rising : direction === 'falling' ? falling : rising || falling;
}

/**
 * Watches a run's accepted steps for crossings; null when the problem declares no events.
 * `method`: the run's method hands its own interpolant to step(), which then locates them.
 */
export function watchEvents(problem: Problem, method = false): EventWatch | null {
  const events = problem.events ?? [];
  if (events.length === 0) return null;
  return method ? methodWatch(problem) : hermiteWatch(problem);
}

function timesByName(problem: Problem, times: number[][]): Record<string, number[]> {
  return Object.fromEntries((problem.events ?? []).map((ev, k) => [ev.name, times[k]!]));
}

function rootTolerance(tA: number, tB: number): number {
  return ROOT_REL_TOL * Math.max(Math.abs(tA), Math.abs(tB), tB - tA);
}

/** Crossings located on the method's own interpolant of each accepted step. */
function methodWatch(problem: Problem): EventWatch {
  const events = problem.events!;
  const yi = new Float64Array(problem.dimension);
  const gPrev = new Float64Array(events.length);
  const gNew = new Float64Array(events.length);
  const times = events.map(() => [] as number[]);
  let started = false;
  return {
    observe(t, y) {
      if (started) return; // later states arrive through step()
      for (let k = 0; k < events.length; k++) gPrev[k] = events[k]!.fn(t, y);
      started = true;
    },
    step(tOld, tNew, evaluate) {
      if (!started || !(tNew > tOld)) return;
      // Both ends from the interpolant, so a crossing is bracketed by the function it is located on.
      evaluate(tNew, yi);
      for (let i = 0; i < yi.length; i++) if (!Number.isFinite(yi[i]!)) return;
      // Every event's g at tNew before any root search: the search reuses yi.
      for (let k = 0; k < events.length; k++) gNew[k] = events[k]!.fn(tNew, yi);
      for (let k = 0; k < events.length; k++) {
        const ev = events[k]!;
        const g = gNew[k]!;
        if (crosses(ev.direction, gPrev[k]!, g)) {
          const at = (s: number) => (evaluate(s, yi), ev.fn(s, yi));
          times[k]!.push(illinoisRoot(at, tOld, gPrev[k]!, tNew, g, rootTolerance(tOld, tNew)));
        }
        gPrev[k] = g;
      }
    },
    found: () => timesByName(problem, times),
    evaluations: () => 0,
  };
}

/** Crossings located on stepgauge's Hermite interpolant of consecutive accepted states. */
function hermiteWatch(problem: Problem): EventWatch {
  const events = problem.events!;
  const n = problem.dimension;
  const orbit = problem.orbit;
  const f = problem.f;
  const ends: StepEnds = {
    tA: NaN,
    tB: NaN,
    yA: new Float64Array(n),
    yB: new Float64Array(n),
    fA: new Float64Array(n),
    fB: new Float64Array(n),
    gA: new Float64Array(n),
    gB: new Float64Array(n),
  };
  const work = { y: new Float64Array(n), fp: new Float64Array(n), fm: new Float64Array(n) };
  const yi = new Float64Array(n);
  const gPrev = new Float64Array(events.length);
  const times = events.map(() => [] as number[]);
  let started = false;
  let evaluations = 0;
  return {
    observe(t, y) {
      if (started && t === ends.tB) return; // the same landing reported twice
      for (let i = 0; i < n; i++) if (!Number.isFinite(y[i]!)) return;
      // Shift B to A, then take the new point as B.
      const ya = ends.yA;
      const fa = ends.fA;
      const ga = ends.gA;
      ends.yA = ends.yB;
      ends.fA = ends.fB;
      ends.gA = ends.gB;
      ends.yB = ya;
      ends.fB = fa;
      ends.gB = ga;
      ends.tA = ends.tB;
      ends.tB = t;
      ends.yB.set(y);
      f(t, ends.yB, ends.fB);
      evaluations += 1 + secondDerivative(f, t, ends.yB, ends.fB, ends.gB, work);
      for (let k = 0; k < events.length; k++) {
        const ev = events[k]!;
        const g = ev.fn(t, ends.yB);
        if (started && crosses(ev.direction, gPrev[k]!, g)) {
          const at = (s: number) => (hermiteAt(ends, s, yi, orbit), ev.fn(s, yi));
          times[k]!.push(illinoisRoot(at, ends.tA, gPrev[k]!, t, g, rootTolerance(ends.tA, t)));
        }
        gPrev[k] = g;
      }
      started = true;
    },
    step() {},
    found: () => timesByName(problem, times),
    evaluations: () => evaluations,
  };
}
