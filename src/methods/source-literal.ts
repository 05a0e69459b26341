// Numbers written into generated step code (the explicit kernels, the Rosenbrock attempts): the
// shortest text that parses back to the same double, bracketed when negative so it can stand
// after any operator.
import { InputError } from '../core/errors.js';

/** `v` as source text; `what` names the coefficient's kind in the message when v is not finite. */
export function numberLiteral(v: number, what: string): string {
  if (!Number.isFinite(v)) throw new InputError(`${what} ${v} is not finite`);
  const s = String(v);
  return v < 0 ? `(${s})` : s;
}
