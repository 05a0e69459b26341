// Defaults shared by the library and the CLI, in a module of their own so the CLI can show them
// in its help without loading the integrators, the sweep machinery or the report renderer.

export interface TimingOptions {
  /** Time budget per run in seconds; long solves get fewer samples. */
  budgetSeconds: number;
  /** Fewest timed samples (after one warm-up solve). */
  minSamples: number;
}

/** Wall-time measurement per run: a 0.1 s budget, at least 3 samples. */
export const DEFAULT_TIMING: TimingOptions = { budgetSeconds: 0.1, minSamples: 3 };

/** The tolerances a sweep runs when none are given: one rtol per decade, 1e-3 down to 1e-10. */
export const DEFAULT_TOLERANCE_RANGE = { loose: 1e-3, tight: 1e-10 } as const;

/** Step limit per run (accepted + rejected steps). */
export const DEFAULT_MAX_STEPS = 100_000;

/** `choose`: candidates must reach target / safety (why 2: see SAFETY_NOTE in src/cli/decision-record.ts). */
export const DEFAULT_SAFETY = 2;

/**
 * The longest --run-timeout: a day. Node's timers hold at most 2^31 - 1 ms (about 24.8 days; a
 * longer delay fires after 1 ms), and certification waits four run timeouts.
 */
export const MAX_RUN_TIMEOUT_SECONDS = 86_400;
