// The times an adaptive solve must land on exactly: the check times inside the span, then tEnd.
import { InputError } from '../core/errors.js';

export function stopTimes(checkTimes: readonly number[] | undefined, t0: number, tEnd: number, methodId: string): Float64Array {
  const inside: number[] = [];
  if (checkTimes) {
    for (let i = 0; i < checkTimes.length; i++) {
      const tc = checkTimes[i]!;
      if (typeof tc !== 'number' || !Number.isFinite(tc)) {
        throw new InputError(`options.checkTimes[${i}] must be a finite number, got ${tc}`, methodId);
      }
      if (tc > t0 && tc < tEnd) inside.push(tc);
    }
  }
  inside.sort((a, b) => a - b);
  const out: number[] = [];
  for (const tc of inside) if (out.length === 0 || out[out.length - 1] !== tc) out.push(tc);
  out.push(tEnd);
  return Float64Array.from(out);
}
