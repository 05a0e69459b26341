// defineProblem: the way a user's module describes a problem in code. It checks the spec, fills
// the defaults and records a stable text of the spec (functions by their source) as the
// definition; the module loader appends a hash of the module's source files.
import type { ErrorScale, Invariant, JacobianBand, JacobianFn, JacobianPattern, OrbitStates, Problem, ProblemEvent, Reference, Rhs, SeparableSplit } from '../core/types.js';
import { InputError } from '../core/errors.js';
import { patternProblem } from '../core/sparse-pattern.js';
import { brand, PROBLEM_BRAND } from './brand.js';

export interface ProblemSpec {
  /** kebab-case id. */
  readonly id: string;
  readonly title: string;
  /** Where the equations and the reference come from. */
  readonly source: string;
  readonly description?: string;
  readonly stateNames?: readonly string[];
  readonly y0: readonly number[];
  /** [t0, tEnd], tEnd > t0. */
  readonly span: readonly [number, number];
  readonly f: Rhs;
  readonly jacobian?: JacobianFn;
  /**
   * df/dy is zero outside `lower` diagonals below and `upper` above the main one: implicit
   * methods then factor band matrices and difference grouped columns.
   */
  readonly jacobianBand?: JacobianBand;
  /**
   * Which entries of df/dy may be nonzero: one list of column indices per row (state), e.g.
   * [[0, 1], [0, 1, 2], [1, 2]]. Implicit methods then factor sparse matrices and difference
   * grouped columns when the pattern is much sparser than the band (README, "Sparse Jacobians").
   */
  readonly jacobianPattern?: JacobianPattern;
  /** Default false. */
  readonly stiff?: boolean;
  /** Default none. */
  readonly invariants?: readonly Invariant[];
  /** Default absolute. */
  readonly errorScale?: ErrorScale;
  /** Default certified (filled in by the sweep). */
  readonly reference?: Reference;
  /** Default none (the end of the span is always checked). */
  readonly checkTimes?: readonly number[];
  /** Default false: methods take their own steps; true when the simulation really stops at the check times. */
  readonly landOnCheckTimes?: boolean;
  readonly separable?: SeparableSplit;
  readonly atolScale?: number | readonly number[];
  /** Position and velocity indices of an orbiting body (runs add the radial / in-track / cross-track split). */
  readonly orbit?: OrbitStates;
  /** Event functions with a direction; crossing times are located in every run. */
  readonly events?: readonly ProblemEvent[];
}

const KEBAB = /^[a-z0-9]+(-[a-z0-9]+)*$/;

function bad(spec: { id?: unknown }, message: string): never {
  throw new InputError(message, `defineProblem(${typeof spec.id === 'string' ? spec.id : '?'})`);
}

function finiteList(spec: ProblemSpec, name: string, v: unknown): readonly number[] {
  if (!Array.isArray(v) || !v.every((x) => typeof x === 'number' && Number.isFinite(x))) bad(spec, `${name} must be a list of finite numbers`);
  return v as number[];
}

/** Stable text of a spec: sorted keys, functions as their source text, typed arrays as lists. */
export function stableText(value: unknown): string {
  const norm = (v: unknown): unknown => {
    if (typeof v === 'function') return `function ${v.toString()}`;
    if (ArrayBuffer.isView(v)) return Array.from(v as unknown as ArrayLike<number>);
    if (Array.isArray(v)) return v.map(norm);
    if (v && typeof v === 'object') {
      const out: Record<string, unknown> = {};
      for (const k of Object.keys(v).sort()) out[k] = norm((v as Record<string, unknown>)[k]);
      return out;
    }
    return v;
  };
  return JSON.stringify(norm(value));
}

export function defineProblem(spec: ProblemSpec): Problem {
  if (!spec || typeof spec !== 'object') throw new InputError('defineProblem needs an object');
  if (typeof spec.id !== 'string' || !KEBAB.test(spec.id)) bad(spec, `id must be kebab-case, got ${JSON.stringify(spec.id)}`);
  if (typeof spec.title !== 'string' || !spec.title.trim()) bad(spec, 'title must be a non-empty text');
  if (typeof spec.source !== 'string' || !spec.source.trim()) bad(spec, 'source must say where the equations and reference come from');
  const y0 = finiteList(spec, 'y0', spec.y0);
  if (y0.length === 0) bad(spec, 'y0 must have at least one entry');
  const span = finiteList(spec, 'span', spec.span);
  if (span.length !== 2) bad(spec, 'span must be [t0, tEnd]');
  const [t0, tEnd] = span as [number, number];
  if (!(tEnd > t0)) bad(spec, `span [${t0}, ${tEnd}] is ${tEnd === t0 ? 'empty' : 'reversed'}`);
  if (typeof spec.f !== 'function') bad(spec, 'f must be a function (t, y, dy) => void');
  if (spec.jacobian !== undefined && typeof spec.jacobian !== 'function') bad(spec, 'jacobian must be a function (t, y, jac) => void');
  const n = y0.length;
  if (spec.stateNames && spec.stateNames.length !== n) bad(spec, `stateNames has ${spec.stateNames.length} names for ${n} states`);
  if (spec.jacobianBand !== undefined) {
    const b = spec.jacobianBand as Partial<JacobianBand> | null;
    const ok = (v: unknown): boolean => Number.isInteger(v) && (v as number) >= 0 && (v as number) < n;
    if (!b || typeof b !== 'object' || !ok(b.lower) || !ok(b.upper)) {
      bad(spec, `jacobianBand must be { lower, upper } with whole numbers in 0..${n - 1}, got ${JSON.stringify(b)}`);
    }
  }
  if (spec.jacobianPattern !== undefined) {
    const wrong = patternProblem(spec.jacobianPattern, n, 'jacobianPattern');
    if (wrong) bad(spec, wrong);
  }
  const checkTimes = [...finiteList(spec, 'checkTimes', spec.checkTimes ?? [])].sort((a, b) => a - b);
  const outside = checkTimes.find((t) => !(t > t0 && t <= tEnd));
  if (outside !== undefined) bad(spec, `check time ${outside} is outside the span (${t0}, ${tEnd}]`);
  if (spec.landOnCheckTimes !== undefined && typeof spec.landOnCheckTimes !== 'boolean') bad(spec, 'landOnCheckTimes must be true or false');
  const invariants = spec.invariants ?? [];
  for (const inv of invariants) {
    if (!inv || typeof inv.name !== 'string' || typeof inv.fn !== 'function') bad(spec, 'each invariant needs a name and a function fn(t, y)');
  }
  if (spec.separable) {
    const all = [...spec.separable.positions, ...spec.separable.velocities];
    if (new Set(all).size !== n || all.some((i) => !Number.isInteger(i) || i < 0 || i >= n)) {
      bad(spec, `separable must split the indices 0..${n - 1} into positions and velocities, each once`);
    }
    const second = spec.separable.secondOrder;
    if (second !== undefined && typeof second !== 'boolean') bad(spec, 'separable.secondOrder must be true or false');
    if (second && spec.separable.positions.length !== spec.separable.velocities.length) {
      bad(spec, 'separable.secondOrder pairs positions[k] with velocities[k] (q\' = v): the two lists need the same length');
    }
  }
  if (spec.orbit) {
    const o = spec.orbit;
    const idx = [...(o.position ?? []), ...(o.velocity ?? [])];
    if (o.position?.length !== 3 || o.velocity?.length !== 3 || idx.some((i) => !Number.isInteger(i) || i < 0 || i >= n) || new Set(idx).size !== 6) {
      bad(spec, `orbit needs three position and three velocity indices, distinct, in 0..${n - 1}`);
    }
    if (typeof o.unit !== 'string' || !o.unit.trim()) bad(spec, "orbit needs the position unit, e.g. unit: 'm'");
  }
  const eventNames = new Set<string>();
  for (const ev of spec.events ?? []) {
    if (!ev || typeof ev.name !== 'string' || !KEBAB.test(ev.name)) bad(spec, 'each event needs a kebab-case name');
    if (eventNames.has(ev.name)) bad(spec, `event ${ev.name} is declared twice`);
    eventNames.add(ev.name);
    if (typeof ev.fn !== 'function') bad(spec, `event ${ev.name} needs a function fn(t, y)`);
    if (!['rising', 'falling', 'both'].includes(ev.direction)) bad(spec, `event ${ev.name}: direction must be rising, falling or both`);
  }
  const reference = spec.reference ?? { kind: 'certified', points: [] };
  if (reference.kind === 'exact' && typeof reference.exact !== 'function') bad(spec, "reference of kind 'exact' needs exact(t, out)");

  // One trial evaluation catches a wrong dimension or a throwing f before any sweep starts.
  const dy = new Float64Array(n);
  try {
    spec.f(t0, Float64Array.from(y0), dy);
  } catch (e) {
    bad(spec, `f(t0, y0) threw: ${e instanceof Error ? e.message : String(e)}`);
  }
  const broken = Array.from(dy).findIndex((v) => !Number.isFinite(v));
  if (broken >= 0) bad(spec, `f(t0, y0) gave a non-finite derivative for component ${broken}`);

  const problem: Problem = {
    id: spec.id,
    title: spec.title,
    source: spec.source,
    ...(spec.description !== undefined ? { description: spec.description } : {}),
    dimension: n,
    ...(spec.stateNames ? { stateNames: [...spec.stateNames] } : {}),
    t0,
    tEnd,
    y0: [...y0],
    f: spec.f,
    ...(spec.jacobian ? { jacobian: spec.jacobian } : {}),
    ...(spec.jacobianBand ? { jacobianBand: { lower: spec.jacobianBand.lower, upper: spec.jacobianBand.upper } } : {}),
    ...(spec.jacobianPattern ? { jacobianPattern: spec.jacobianPattern.map((row) => [...row]) } : {}),
    stiff: spec.stiff ?? false,
    invariants,
    errorScale: spec.errorScale ?? { kind: 'absolute' },
    reference,
    checkTimes,
    ...(spec.landOnCheckTimes === true ? { landOnCheckTimes: true } : {}),
    ...(spec.separable ? { separable: spec.separable } : {}),
    ...(spec.atolScale !== undefined ? { atolScale: spec.atolScale } : {}),
    ...(spec.orbit ? { orbit: spec.orbit } : {}),
    ...(spec.events ? { events: spec.events } : {}),
    definition: stableText(spec),
  };
  return brand(problem, PROBLEM_BRAND);
}
