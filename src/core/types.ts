// Shared types: the problem, method, setting and solve-result shapes every layer speaks.
// Vectors are Float64Array; matrices are row-major Float64Array of length n*n.

/** Right-hand side of y' = f(t, y): writes f(t, y) into dy, never allocates. */
export type Rhs = (t: number, y: Float64Array, dy: Float64Array) => void;

/** Jacobian df/dy at (t, y), written row-major into jac (jac[i*n + j] = dfi/dyj). */
export type JacobianFn = (t: number, y: Float64Array, jac: Float64Array) => void;

export interface Invariant {
  readonly name: string;
  readonly fn: (t: number, y: Float64Array) => number;
}

/**
 * How error is measured per component. `absolute`: |y_i - ref_i|.
 * `relative`: |y_i - ref_i| / max(|ref_i|, floor_i).
 */
export type ErrorScale =
  | { readonly kind: 'absolute' }
  | { readonly kind: 'relative'; readonly floor: number | readonly number[] };

/**
 * `trajectory`: a table from elsewhere (a higher-fidelity tool), with its digits and source.
 * `self`: an external program at a much tighter setting; it cannot reveal a model error or a bias
 * that every setting shares.
 */
export type ReferenceKind = 'exact' | 'published' | 'certified' | 'trajectory' | 'self';

/**
 * Where a problem keeps one body's position and velocity (three indices each), so its error can
 * be split into radial, in-track and cross-track parts relative to the reference orbit.
 */
export interface OrbitStates {
  readonly position: readonly [number, number, number];
  readonly velocity: readonly [number, number, number];
  /** Unit of the position components, e.g. 'm' (errors are reported in it). */
  readonly unit: string;
}

/** The structure x' = A x + B u(t) of a linear problem, for methods that discretise it exactly. */
export interface LinearStructure {
  /** n x n, row-major. */
  readonly A: Float64Array;
  /** n x m, row-major. */
  readonly B: Float64Array;
  /** Number of inputs m. */
  readonly inputs: number;
  /** u(t) written into out (length m). */
  readonly input: (t: number, out: Float64Array) => void;
}

/** Which zero crossings of an event function count: upward, downward or both. */
export type EventDirection = 'rising' | 'falling' | 'both';

/** An event: the times where fn(t, y) crosses zero in the given direction. */
export interface ProblemEvent {
  /** kebab-case name, unique in the problem. */
  readonly name: string;
  readonly fn: (t: number, y: Float64Array) => number;
  readonly direction: EventDirection;
}

export interface ReferencePoint {
  readonly t: number;
  readonly y: readonly number[];
}

export interface Reference {
  readonly kind: ReferenceKind;
  /** Trusted significant digits of the reference values (published or certified). */
  readonly digits?: number;
  readonly source?: string;
  /** Analytic solution: writes y(t) into out. Present when kind is 'exact'. */
  readonly exact?: (t: number, out: Float64Array) => void;
  /**
   * A computed reference evaluable at any time in the span (a certificate's dense solution): writes
   * y(t) into out. Its resolution is the certificate's, like its tabulated points.
   */
  readonly dense?: (t: number, out: Float64Array) => void;
  /** Reference states at given times (published tables, certified runs). Sorted by t. */
  readonly points?: readonly ReferencePoint[];
  /**
   * For a certified reference: the methods whose agreement made it, their tolerance, and each
   * certifying run (one of them with a bounded step). choose never recommends these or tighter.
   */
  readonly certifiedBy?: {
    readonly methods: readonly string[];
    readonly rtol?: number;
    readonly runs?: readonly { readonly method: string; readonly rtol: number; readonly maxStep?: number }[];
  };
  /** Why no reference could be had (a certification that failed): every run says so. */
  readonly unavailable?: string;
  /** Reference times of each event (by event name), sorted; analytic where the problem has them. */
  readonly eventTimes?: Readonly<Record<string, readonly number[]>>;
  /**
   * Why a computed reference cannot be trusted (a certificate with too few agreeing digits): runs
   * keep their status, their errors are null, and choose refuses.
   */
  readonly untrusted?: string;
  /**
   * Resolution of an exact reference that is computed numerically (a matrix exponential, say),
   * relative to the state's largest component. Round-off (../measure/resolution.ts) when absent.
   */
  readonly floor?: number;
}

/** Lower and upper bandwidth of a Jacobian (0, 0: diagonal). */
export interface JacobianBand {
  readonly lower: number;
  readonly upper: number;
}

/**
 * Which entries of the Jacobian may be nonzero: entry i lists the columns of row i (the states
 * equation i depends on), each once, in 0..n-1. The diagonal is always kept by the solvers
 * (iteration matrices have it) whether listed or not.
 */
export type JacobianPattern = readonly (readonly number[])[];

/** Index split for separable problems q' = g(p), p' = h(t, q) (symplectic methods need it). */
export interface SeparableSplit {
  /** Indices of position-like states, whose derivatives depend only on `velocities`. */
  readonly positions: readonly number[];
  /** Indices of velocity-like states, whose derivatives depend only on `positions` and t. */
  readonly velocities: readonly number[];
  /**
   * Each positions[k]' is exactly velocities[k] (q' = v, so q'' = v'(t, q)): the second-order form
   * Runge-Kutta-Nystrom methods step. The lists are paired in order and of equal length.
   */
  readonly secondOrder?: boolean;
}

/** Output map y = g(t, x) (like y = Cx + Du): written into out (length names.length), never allocates. */
export interface ProblemOutputs {
  readonly names: readonly string[];
  readonly fn: (t: number, y: Float64Array, out: Float64Array) => void;
}

export interface ProblemUnits {
  readonly time?: string;
  readonly states?: Readonly<Record<string, string>>;
  readonly outputs?: Readonly<Record<string, string>>;
}

export interface Problem {
  /** kebab-case id, unique in a sweep. */
  readonly id: string;
  readonly title: string;
  /** Where the equations and reference values come from. */
  readonly source: string;
  /**
   * Equations and notes in plain text, for library users (a catalogue problem's is its file's
   * header comment, which also ends its definition, the text reports show).
   */
  readonly description?: string;
  readonly dimension: number;
  readonly stateNames?: readonly string[];
  readonly t0: number;
  readonly tEnd: number;
  readonly y0: readonly number[];
  readonly f: Rhs;
  readonly jacobian?: JacobianFn;
  /**
   * df/dy is zero outside `lower` diagonals below and `upper` above the main one (method-of-lines
   * models, chains): implicit methods then factor band matrices and difference only
   * lower + upper + 1 grouped columns for a Jacobian.
   */
  readonly jacobianBand?: JacobianBand;
  /**
   * The Jacobian's sparsity pattern, when it is sparse but not narrow-banded (2-D grids,
   * networks): implicit methods then factor sparse matrices (src/core/sparse-lu.ts) and difference
   * grouped columns (src/core/column-groups.ts). With a band too, the solve takes the cheaper
   * (src/core/jacobian-structure.ts).
   */
  readonly jacobianPattern?: JacobianPattern;
  /** True when the problem is meant for stiff methods; sweeps pair it with those by default. */
  readonly stiff: boolean;
  readonly invariants: readonly Invariant[];
  readonly errorScale: ErrorScale;
  readonly reference: Reference;
  /**
   * Output times (inside the span, excluding t0, sorted) at which the error is reported from each
   * method's interpolant (or where methods land, with landOnCheckTimes). The end is always checked.
   */
  readonly checkTimes: readonly number[];
  /**
   * True when the simulation really stops at the check times (discrete controller ticks,
   * impulses): adaptive methods then land on them exactly. By default they take their own steps
   * and the values at check times come from each method's interpolant.
   */
  readonly landOnCheckTimes?: boolean;
  readonly separable?: SeparableSplit;
  /**
   * Equal-step counts for fixed-step methods when the user gives none: a ladder reaching the
   * asymptotic range of this problem (the sweep's default ladder otherwise).
   */
  readonly defaultSteps?: readonly number[];
  /**
   * Tolerances for adaptive methods when the user gives none (the sweep's 1e-3..1e-10
   * otherwise): a costly problem can stop where its runs stay affordable.
   */
  readonly defaultTolerances?: readonly number[];
  /** Absolute tolerance to use when the user gives only rtol: atol = rtol * atolScale (default 1). */
  readonly atolScale?: number | readonly number[];
  /** Outputs computed from the state; the error is measured on them when errorOn is 'outputs'. */
  readonly outputs?: ProblemOutputs;
  readonly errorOn?: 'states' | 'outputs';
  /** Position and velocity of an orbiting body: runs also report radial / in-track / cross-track error. */
  readonly orbit?: OrbitStates;
  /** Event functions whose crossing times are located in every run and compared with the reference's. */
  readonly events?: readonly ProblemEvent[];
  /** Set for linear problems x' = A x + B u: the hold discretisations need it. */
  readonly linear?: LinearStructure;
  /** Why no separable split exists (said when a symplectic method is refused). */
  readonly separableReason?: string;
  /** Units declared by the problem (shown on plot axes; nothing is converted). */
  readonly units?: ProblemUnits;
  /** True when the model lives only in the user's program (a program-model file): no f to call. */
  readonly modelOnlyInPrograms?: boolean;
  /** Named numeric parameters of the model, sent to external programs (empty when none). */
  readonly parameters?: Readonly<Record<string, number>>;
  /** Canonical text of the definition, hashed (SHA-256) so auditors can tell two problems apart. */
  readonly definition: string;
  /**
   * The exact solution from another initial state at t0, where the model has one in closed form
   * (two-body orbits): lets a dispersion keep an exact reference for every sample.
   */
  readonly exactFromState?: (y0: readonly number[]) => { exact: (t: number, out: Float64Array) => void; source: string } | undefined;
  /** Set on one sample of a dispersed problem: which problem it disperses and with what values. */
  readonly dispersion?: DispersionTag;
}

/** A dispersion sample's identity: reproducible from (of, seed, sample) alone. */
export interface DispersionTag {
  /** Id of the nominal problem. */
  readonly of: string;
  /** 1-based sample number; explicit cases follow the random samples. */
  readonly sample: number;
  /** True for an explicit case of the dispersion block (not a random draw). */
  readonly explicitCase: boolean;
  readonly seed: number;
  /** The dispersed initial states and parameters of this sample, by name. */
  readonly values: Readonly<Record<string, number>>;
}

export type Family =
  | 'fixed-step'
  | 'embedded-explicit'
  | 'symplectic'
  | 'implicit'
  | 'extrapolation'
  | 'external';

export type Setting =
  | { readonly rtol: number; readonly atol: number | readonly number[] }
  | { readonly steps: number };

export type Status = 'ok' | 'diverged' | 'step-underflow' | 'step-limit' | 'timeout' | 'error';
/** Every status, in the order reports list them. */
export const STATUSES: readonly Status[] = ['ok', 'diverged', 'step-underflow', 'step-limit', 'timeout', 'error'];

/** Exact, deterministic work counters; part of every result. */
export interface Counts {
  /** Right-hand side evaluations (including those spent on finite-difference Jacobians). */
  nfev: number;
  /** Jacobian evaluations (analytic or finite-difference). */
  njev: number;
  /** LU factorizations (a complex factorization counts as one). */
  nlu: number;
  accepted: number;
  rejected: number;
}

/**
 * Step-size controllers of the explicit pairs (methods/explicit/control.ts): `standard`, `pi`
 * (Gustafsson's PI), `deadband` (standard, but the step is kept while 0.5 <= err <= 1).
 */
export const CONTROLLER_KINDS = ['standard', 'pi', 'deadband'] as const;
export type ControllerKind = (typeof CONTROLLER_KINDS)[number];

export interface SolveOptions {
  /** Largest number of steps (accepted + rejected) before status `step-limit`. */
  readonly maxSteps: number;
  /**
   * Called with the state at t0 and after every accepted step (including each landing on a check
   * time). y is the solver's own buffer: read it, do not keep it.
   */
  readonly observer?: (t: number, y: Float64Array) => void;
  /** Adaptive methods never step past these (sorted, inside the span); they land on them exactly. */
  readonly checkTimes?: readonly number[];
  /** Step-size controller for adaptive explicit methods (standard when absent). */
  readonly controller?: ControllerKind;
  /**
   * Largest step an adaptive method may take (used by certification, so no feature shorter than
   * the natural step can be stepped over); unbounded when absent.
   */
  readonly maxStep?: number;
  /** Initial step; automatic when absent. */
  readonly initialStep?: number;
  /** performance.now() value after which the solver stops with status `timeout`. */
  readonly deadline?: number;
}

export interface SolveResult {
  status: Status;
  message?: string;
  /** Time reached (tEnd when status is ok). */
  tFinal: number;
  yFinal: Float64Array;
  counts: Counts;
  /** Step size actually used, for fixed-step methods. */
  h?: number;
  /** False when the method does not report its work (an external program without counts). */
  countsReported?: boolean;
  /** Number of states the method reported along the way (external programs), for the error note. */
  reportedPoints?: number;
  /** SHA-256 of everything the method reported (external programs), to find settings that change nothing. */
  outputSha256?: string;
  /** Event crossing times the method located itself, by event name (external programs that report them). */
  eventTimes?: Record<string, number[]>;
}

/** How a solve's time was obtained when the method times itself (external programs). */
export type TimeBasis = 'reported' | 'wall-minus-start-up';

/** What an external program's method record says about the program (kept in results.json). */
export interface ProgramRecord {
  /** The program file, as given on the command line. */
  readonly file: string;
  readonly sha256: string;
  readonly argv: readonly string[];
  readonly protocol: 'once' | 'lines';
  readonly settings: 'steps' | 'tolerance';
}

export interface Method {
  /** kebab-case id, e.g. `dormand-prince-54`. */
  readonly id: string;
  /** Display name after the published method, e.g. "Dormand-Prince 5(4)". */
  readonly name: string;
  readonly family: Family;
  /** Published order of the propagated solution. */
  readonly order: number;
  /** The paper (or book section) the coefficients come from. */
  readonly source: string;
  /** Adaptive methods take {rtol, atol}; the others {steps}. */
  readonly adaptive: boolean;
  /** Meant for stiff problems (implicit, L-stable, ...). */
  readonly stiff: boolean;
  /** Set for methods that need the problem's separable split (symplectic). */
  readonly needsSeparable?: boolean;
  /** Set for methods that need a separable split in second-order form, q' = v (Runge-Kutta-Nystrom). */
  readonly needsSecondOrder?: boolean;
  /** Set for methods that need a linear problem x' = A x + B u (exact discretisations). */
  readonly needsLinear?: boolean;
  /** Order of the embedded error estimate, for adaptive pairs. */
  readonly embeddedOrder?: number;
  /**
   * For planning only: steps grow like rtol^(-stepGrowth). Without it, 1/(order + 1), what
   * per-step error control of an order-p method gives; a method that maps its tolerance says so.
   */
  readonly stepGrowth?: number;
  readonly notes?: string;
  /**
   * For a method that maps the requested tolerance internally (as RADAU5 does): the rtol it
   * actually controls to; atol is scaled by the same ratio. Recorded with every run.
   */
  readonly effectiveRtol?: (rtol: number) => number;
  /** Set for a user's own program run through the program protocol (family `external`). */
  readonly program?: ProgramRecord;
  /** False when the method cannot be run backwards in time (no round-trip error). */
  readonly roundTrip?: boolean;
  /**
   * For methods that time themselves (external programs): the seconds of one solve at this
   * setting, and how they were obtained; null when there are none. Replaces repeated timing.
   */
  solveSeconds?(problem: Problem, setting: Setting, options: SolveOptions): { seconds: number; basis: TimeBasis } | null;
  solve(problem: Problem, setting: Setting, options: SolveOptions): SolveResult;
}

export type AdaptiveSetting = Extract<Setting, { readonly rtol: number }>;
export type FixedStepSetting = Extract<Setting, { readonly steps: number }>;

export function isAdaptiveSetting(s: Setting): s is AdaptiveSetting {
  return 'rtol' in s;
}

export function zeroCounts(): Counts {
  return { nfev: 0, njev: 0, nlu: 0, accepted: 0, rejected: 0 };
}
