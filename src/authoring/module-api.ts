// What a user's module can import from 'stepgauge' when the package's public index does not yet
// offer the module-authoring functions (see module-loader.ts). Keep it in step with src/index.ts.
export { defineProblem, stableText, type ProblemSpec } from './define-problem.js';
export { defineMethod, type MethodSpec } from './define-method.js';
export { InputError } from '../core/errors.js';
export { zeroCounts, isAdaptiveSetting } from '../core/types.js';
export type * from '../core/types.js';
