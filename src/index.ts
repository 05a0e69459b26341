// The public API of stepgauge as a library: what a user module, a script or a team's own test
// suite needs to author problems and methods, run sweeps, read results and gate on them
// (README, "Library API"). Internals (worker lanes, raw LU, the atomic folder writer) stay out;
// the CLI is a thin layer over the same functions.

// Shared types and small helpers
export type * from './core/types.js';
export { zeroCounts, isAdaptiveSetting } from './core/types.js';
export type { ResultsFile, RunResult, RunSetting, ProblemRecord, Environment, DriftTrace } from './results/contract.js';
export { RESULTS_FORMAT, RESULTS_VERSION, runKey } from './results/contract.js';
export { InputError, isInputError } from './core/errors.js';

// Authoring problems and methods
export { defineProblem, stableText, type ProblemSpec } from './authoring/define-problem.js';
export { defineMethod, type MethodSpec } from './authoring/define-method.js';
export { loadProblemFile } from './problems/load-file.js';
export { loadModule, loadProblemModule, loadMethodModule } from './authoring/module-loader.js';

// Built-ins
export { builtinMethods, findMethod } from './methods/registry.js';
export { catalogue, findProblem } from '../problems/index.js';

// Measuring and sweeping
export { measureRun, type RunOptions } from './measure/run-one.js';
export { timeRun, DEFAULT_TIMING, type TimingOptions } from './measure/timing.js';
export { withCertifiedReference, certify } from './measure/certify.js';
export { roundTripError } from './measure/round-trip.js';
export { stiffnessRatio } from './measure/stiffness.js';
export { runSweep, type SweepRequest } from './sweep/run.js';
export { planSweep, DEFAULT_TOLERANCES, DEFAULT_STEPS, type PlannedRun, type SweepPlan } from './sweep/plan.js';
export { chooseMethod, type Choice, type Candidate, type ChooseOptions } from './sweep/choose.js';
export { selectShard, parseShardSpec } from './sweep/shard.js';
export { mergeResults } from './results/merge.js';

// Results files, reports and the gate
export { readResultsFile, validateResults } from './results/read.js';
export { resultsCsv } from './results/csv.js';
export { resultsJson } from './results/json.js';
export { writeReport } from './report/index.js';
export { compareResults, type Comparison, type CompareOptions } from './gate/compare.js';
export { makeBaseline, serializeBaseline, readBaselineFile, type Baseline } from './gate/baseline.js';
export { junitXml } from './gate/junit.js';
export { compareToBaseline, expectWithinBaseline } from './gate/vitest.js';
