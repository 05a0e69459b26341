// One object layout for every problem. The solvers and the run watcher read a problem's fields
// in functions whose optimised code V8 keeps from solve to solve; problems written as different
// object literals (each catalogue file, defineProblem, problem files, a certified copy) each get
// their own hidden class, and every new one such a function meets discards its optimised code
// ("wrong map") and has it compiled again. On the catalogue sweep these recompilations were a
// large share of V8's compile time, which a parallel sweep's workers pay on the cores the runs
// need (bench/README.md). So problems are copied into one layout before they are solved: every
// field present (undefined when not given), always in this order, nested records likewise.
import type { ErrorScale, Invariant, Problem, Reference } from '../core/types.js';

function uniformReference(r: Reference): Reference {
  return {
    kind: r.kind,
    digits: r.digits,
    source: r.source,
    exact: r.exact,
    dense: r.dense,
    points: r.points,
    certifiedBy: r.certifiedBy,
    unavailable: r.unavailable,
    eventTimes: r.eventTimes,
    untrusted: r.untrusted,
    floor: r.floor,
  };
}

function uniformErrorScale(e: ErrorScale): ErrorScale {
  return { kind: e.kind, floor: e.kind === 'relative' ? e.floor : undefined } as ErrorScale;
}

function uniformInvariant(i: Invariant): Invariant {
  return { name: i.name, fn: i.fn };
}

/** `p` with the one layout (see the header); values are shared, not copied. */
export function uniformProblem(p: Problem): Problem {
  return {
    id: p.id,
    title: p.title,
    source: p.source,
    description: p.description,
    dimension: p.dimension,
    stateNames: p.stateNames,
    t0: p.t0,
    tEnd: p.tEnd,
    y0: p.y0,
    f: p.f,
    jacobian: p.jacobian,
    jacobianBand: p.jacobianBand,
    jacobianPattern: p.jacobianPattern,
    stiff: p.stiff,
    invariants: p.invariants.map(uniformInvariant),
    errorScale: uniformErrorScale(p.errorScale),
    reference: uniformReference(p.reference),
    checkTimes: p.checkTimes,
    landOnCheckTimes: p.landOnCheckTimes,
    separable: p.separable,
    defaultSteps: p.defaultSteps,
    defaultTolerances: p.defaultTolerances,
    atolScale: p.atolScale,
    outputs: p.outputs,
    errorOn: p.errorOn,
    orbit: p.orbit,
    events: p.events,
    linear: p.linear,
    separableReason: p.separableReason,
    units: p.units,
    parameters: p.parameters,
    modelOnlyInPrograms: p.modelOnlyInPrograms,
    definition: p.definition,
    exactFromState: p.exactFromState,
    dispersion: p.dispersion,
  };
}
