// A full garbage collection on request. A streamed sweep's main process receives every run once
// and keeps none, but V8 lets its old generation fill with the dead runs up to two or three times
// what is live before it collects (bench/README.md, the dispersion benchmark), which set the
// sweep's peak memory; asking for a collection every few thousand runs keeps it near what is live.
// V8 offers the collector to code only with --expose-gc; the flag can be set at run time, and a
// new context then has `gc`.
import { setFlagsFromString } from 'node:v8';
import { runInNewContext } from 'node:vm';

let collect: (() => void) | null | undefined;

/** Runs a full collection, or does nothing where the runtime does not allow it. */
export function collectGarbage(): void {
  if (collect === undefined) {
    try {
      setFlagsFromString('--expose-gc');
      const gc: unknown = runInNewContext('typeof gc === "function" ? gc : null');
      collect = typeof gc === 'function' ? (gc as () => void) : null;
    } catch {
      collect = null;
    }
  }
  collect?.();
}
