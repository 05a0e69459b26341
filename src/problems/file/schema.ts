// Shape of a problem file, checked with zod before any expression is read. Meaning (symbols,
// dimensions, spans) is checked afterwards by the builders, which know the names involved.
// The JSON Schema for editors (schema/problem.schema.json) describes the same shape.
import { z } from 'zod';
import { dispersionSpec } from '../dispersion/spec.js';

/** A number, or an expression text (mathjs syntax, restricted; see src/problems/expression). */
export const expressionValue = z.union([z.number(), z.string()]);
const namedExpressions = z.record(z.string(), expressionValue);

const errorSpec = z.strictObject({
  measure: z.enum(['states', 'outputs']).optional(),
  scale: z.enum(['absolute', 'relative']).optional(),
  /** Floor of the relative scale: one number, one per component in order, or by name. */
  floor: z.union([z.number().positive(), z.array(z.number().positive()), z.record(z.string(), z.number().positive())]).optional(),
});

const atolScale = z.union([z.number().positive(), z.array(z.number().positive())]);

const common = {
  id: z.string().regex(/^[a-z0-9]+(-[a-z0-9]+)*$/, 'must be kebab-case (lowercase letters, digits and single hyphens)'),
  /** The id when left out. */
  title: z.string().min(1).optional(),
  source: z.string().optional(),
  description: z.string().optional(),
  parameters: namedExpressions.optional(),
  span: z.tuple([expressionValue, expressionValue]),
  checkTimes: z.array(expressionValue).optional(),
  /** Adaptive methods land exactly on the check times (the simulation really stops there). */
  landOnCheckTimes: z.boolean().optional(),
  invariants: namedExpressions.optional(),
  error: errorSpec.optional(),
  stiff: z.boolean().optional(),
  atolScale: atolScale.optional(),
  /** Units of t, of states and of outputs by name: shown on plot axes; no conversion is done. */
  units: z
    .strictObject({
      time: z.string().min(1).optional(),
      states: z.record(z.string(), z.string().min(1)).optional(),
      outputs: z.record(z.string(), z.string().min(1)).optional(),
    })
    .optional(),
  /** Samples of initial states and parameters (src/problems/dispersion). */
  dispersion: dispersionSpec.optional(),
};

/** A 1-D table: inline x and y, or a two-column CSV beside the problem file. */
const tableSpec = z.strictObject({
  x: z.array(z.number()).optional(),
  y: z.array(z.number()).optional(),
  csv: z.string().optional(),
  interpolation: z.enum(['linear', 'log-linear', 'monotone-cubic']).optional(),
  /** The table is of t: its breakpoints are times where the model is not smooth (added to checkTimes). */
  nonSmoothTimes: z.boolean().optional(),
});

export const equationFileSchema = z.strictObject({
  ...common,
  states: z.array(z.string()).min(1),
  /** Named groups of states (or other scalar names), usable as vectors in expressions. */
  vectors: z.record(z.string(), z.array(z.string()).min(2)).optional(),
  /** Event functions: the times where the expression crosses zero in the direction given. */
  events: z
    .record(z.string(), z.strictObject({ expression: expressionValue, direction: z.enum(['rising', 'falling', 'both']).optional() }))
    .optional(),
  /** An orbiting body's position and velocity states (three each), for radial / in-track / cross-track error. */
  orbit: z.strictObject({ position: z.array(z.string()).length(3), velocity: z.array(z.string()).length(3), unit: z.string().min(1) }).optional(),
  /** Tables callable in expressions by name: rho(h). */
  tables: z.record(z.string(), tableSpec).optional(),
  definitions: namedExpressions.optional(),
  equations: namedExpressions,
  initial: namedExpressions,
  outputs: namedExpressions.optional(),
  separable: z.strictObject({ positions: z.array(z.string()).min(1), velocities: z.array(z.string()).min(1) }).optional(),
  reference: z
    .strictObject({
      exact: namedExpressions.optional(),
      at: z.array(z.record(z.string(), z.number())).min(1).optional(),
      source: z.string().optional(),
      digits: z.number().int().min(1).max(17).optional(),
    })
    .optional(),
});
export type EquationFile = z.infer<typeof equationFileSchema>;

/** Inline rows of numbers (or parameter expressions), or a CSV path relative to the problem file. */
const matrixSpec = z.union([z.array(z.array(expressionValue)), z.string()]);

const waveSpec = z.strictObject({
  amplitude: expressionValue.optional(),
  /** Angular frequency, radians per unit of t. */
  omega: expressionValue,
  phase: expressionValue.optional(),
  /** Exponential envelope rate: amplitude * exp(growth * t); negative for decay. */
  growth: expressionValue.optional(),
});

/** One term of an input signal. A bare string is any expression of t (no exact reference). */
export const signalTerm = z.union([
  z.number(),
  z.string(),
  z.strictObject({ constant: expressionValue }),
  z.strictObject({ poly: z.array(expressionValue).min(1) }),
  z.strictObject({ exp: z.strictObject({ amplitude: expressionValue.optional(), rate: expressionValue }) }),
  z.strictObject({ sin: waveSpec }),
  z.strictObject({ cos: waveSpec }),
]);
export type SignalTerm = z.infer<typeof signalTerm>;
/** An input channel: one term, or a list of terms that are added. */
export const signalSpec = z.union([signalTerm, z.array(signalTerm).min(1)]);
export type SignalSpec = z.infer<typeof signalSpec>;

export const linearFileSchema = z.strictObject({
  ...common,
  states: z.array(z.string()).min(1).optional(),
  linear: z.strictObject({ A: matrixSpec, B: matrixSpec.optional(), C: matrixSpec.optional(), D: matrixSpec.optional() }),
  inputs: z.array(signalSpec).optional(),
  initial: z.array(expressionValue).min(1),
  /** Names of the outputs y = C x + D u, in row order of C. */
  outputs: z.array(z.string()).optional(),
  reference: z
    .strictObject({
      at: z.array(z.record(z.string(), z.number())).min(1),
      source: z.string().optional(),
      digits: z.number().int().min(1).max(17).optional(),
    })
    .optional(),
});
export type LinearFile = z.infer<typeof linearFileSchema>;
export type MatrixSpec = z.infer<typeof matrixSpec>;

/** A file that disperses a built-in problem: its id and the dispersion block. */
export const dispersionFileSchema = z.strictObject({
  base: z.string().min(1),
  dispersion: dispersionSpec,
});

/**
 * A model that only the user's own program has (`model: program`): no equations, so only external
 * programs can run it, and its reference is a trajectory from elsewhere or the program itself at a
 * much tighter setting (a self-reference).
 */
export const programModelFileSchema = z.strictObject({
  id: common.id,
  title: common.title,
  source: common.source,
  description: common.description,
  parameters: common.parameters,
  span: common.span,
  checkTimes: common.checkTimes,
  invariants: common.invariants,
  error: common.error,
  stiff: common.stiff,
  atolScale: common.atolScale,
  model: z.literal('program'),
  states: z.array(z.string()).min(1),
  initial: namedExpressions,
  reference: z.strictObject({
    /** CSV beside the problem file: header t,<states>, one row per time, the last at the span's end. */
    trajectory: z.string().min(1).optional(),
    /** The program itself at a much tighter setting. */
    self: z.literal(true).optional(),
    digits: z.number().int().min(1).max(17).optional(),
    source: z.string().optional(),
  }),
});
export type ProgramModelFile = z.infer<typeof programModelFileSchema>;
