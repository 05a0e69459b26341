// The only functions an expression in a user's file may call, and the JavaScript each becomes.
// Emitters receive already-generated argument code and never user text, so a name outside this
// table can never reach generated source.

export interface FunctionRule {
  readonly minArgs: number;
  readonly maxArgs: number;
  readonly emit: (args: readonly string[]) => string;
}

const unary = (js: string): FunctionRule => ({ minArgs: 1, maxArgs: 1, emit: (a) => `${js}(${a[0]})` });
const variadic = (js: string): FunctionRule => ({ minArgs: 1, maxArgs: Infinity, emit: (a) => `${js}(${a.join(', ')})` });
const reciprocal = (js: string): FunctionRule => ({ minArgs: 1, maxArgs: 1, emit: (a) => `(1 / ${js}(${a[0]}))` });

/** Callable from problem files. */
export const USER_FUNCTIONS: ReadonlyMap<string, FunctionRule> = new Map<string, FunctionRule>([
  ['sin', unary('Math.sin')],
  ['cos', unary('Math.cos')],
  ['tan', unary('Math.tan')],
  ['asin', unary('Math.asin')],
  ['acos', unary('Math.acos')],
  ['atan', unary('Math.atan')],
  ['atan2', { minArgs: 2, maxArgs: 2, emit: (a) => `Math.atan2(${a[0]}, ${a[1]})` }],
  ['sinh', unary('Math.sinh')],
  ['cosh', unary('Math.cosh')],
  ['tanh', unary('Math.tanh')],
  ['exp', unary('Math.exp')],
  // mathjs reads log(x, b) as log(x) / log(b); keep that meaning.
  ['log', { minArgs: 1, maxArgs: 2, emit: (a) => (a.length === 1 ? `Math.log(${a[0]})` : `(Math.log(${a[0]}) / Math.log(${a[1]}))`) }],
  ['log10', unary('Math.log10')],
  ['sqrt', unary('Math.sqrt')],
  ['abs', unary('Math.abs')],
  ['min', variadic('Math.min')],
  ['max', variadic('Math.max')],
  ['pow', { minArgs: 2, maxArgs: 2, emit: (a) => `Math.pow(${a[0]}, ${a[1]})` }],
  ['floor', unary('Math.floor')],
  ['ceil', unary('Math.ceil')],
  ['sign', unary('Math.sign')],
  ['hypot', variadic('Math.hypot')],
  ['cbrt', unary('Math.cbrt')],
]);

/**
 * Also accepted in Jacobian entries, because mathjs `derivative` writes them (d tan = sec^2,
 * d tanh = sech^2, ...). Users cannot call them: the derivative of a validated expression is the
 * only place they can come from.
 */
export const DERIVATIVE_FUNCTIONS: ReadonlyMap<string, FunctionRule> = new Map<string, FunctionRule>([
  ...USER_FUNCTIONS,
  ['sec', reciprocal('Math.cos')],
  ['csc', reciprocal('Math.sin')],
  ['cot', reciprocal('Math.tan')],
  ['sech', reciprocal('Math.cosh')],
  ['csch', reciprocal('Math.sinh')],
  ['coth', reciprocal('Math.tanh')],
  ['square', { minArgs: 1, maxArgs: 1, emit: (a) => `Math.pow(${a[0]}, 2)` }],
  ['cube', { minArgs: 1, maxArgs: 1, emit: (a) => `Math.pow(${a[0]}, 3)` }],
]);

/** Names a user may not give to a state, parameter, definition, output or invariant. */
export const RESERVED_NAMES: ReadonlySet<string> = new Set([
  't', 'pi', 'e', 'i', 'E', 'PI', 'Infinity', 'NaN', 'true', 'false', 'null', 'undefined',
  ...DERIVATIVE_FUNCTIONS.keys(),
]);
