// The configuration a sweep ran under, as far as it decides the numbers a gate compares: the
// step-size controller, the step limit, an --atol override, the stepgauge version and each
// method's hash. `check` states any difference in its first line and compares only runs that
// the difference cannot touch.
import type { Counts, Status } from '../core/types.js';
import type { ResultsFile } from '../results/contract.js';

export interface Configuration {
  controller: string;
  maxSteps: number | null;
  /** The --atol override, or null (atol from rtol and the problem). */
  atol: number | number[] | null;
  stepgauge: string;
  methods: { id: string; family: string; sha256: string | null }[];
}

/** The configuration recorded in a results file (its request and method records). */
export function resultsConfiguration(results: ResultsFile): Configuration {
  const req = (results.request ?? {}) as { controller?: string; maxSteps?: number; atol?: number | number[] };
  const methods = Array.isArray(results.methods) ? (results.methods as { id?: unknown; family?: unknown; sha256?: unknown }[]) : [];
  return {
    controller: req.controller ?? 'standard',
    maxSteps: typeof req.maxSteps === 'number' ? req.maxSteps : null,
    atol: req.atol ?? null,
    stepgauge: String(results.environment.stepgauge),
    methods: methods
      .filter((m) => typeof m.id === 'string')
      .map((m) => ({ id: m.id as string, family: typeof m.family === 'string' ? m.family : 'unknown', sha256: typeof m.sha256 === 'string' ? m.sha256 : null }))
      .sort((a, b) => (a.id < b.id ? -1 : a.id > b.id ? 1 : 0)),
  };
}

/** What the comparability rule reads from a run (a baseline run or a results run). */
interface RunLike {
  method: string;
  status: Status;
  counts: Counts;
}

export interface ConfigurationDiff {
  /** One phrase per difference, baseline value first. */
  differences: string[];
  /** Whether a run (present in both) can still be compared like for like, and if not why. */
  comparable(b: RunLike, c: RunLike): string | null;
}

function same(a: unknown, b: unknown): boolean {
  return JSON.stringify(a) === JSON.stringify(b);
}

export function diffConfigurations(base: Configuration | null, cur: Configuration | null): ConfigurationDiff {
  if (!base || !cur) return { differences: [], comparable: () => null };
  const differences: string[] = [];
  const family = new Map([...base.methods, ...cur.methods].map((m) => [m.id, m.family]));
  const controllerDiffers = base.controller !== cur.controller;
  if (controllerDiffers) differences.push(`step-size controller ${base.controller} (baseline) vs ${cur.controller} (now)`);
  const limitDiffers = base.maxSteps !== cur.maxSteps;
  if (limitDiffers) differences.push(`step limit ${base.maxSteps ?? 'not recorded'} (baseline) vs ${cur.maxSteps ?? 'not recorded'} (now)`);
  if (!same(base.atol, cur.atol)) differences.push(`--atol ${base.atol === null ? 'not given' : JSON.stringify(base.atol)} (baseline) vs ${cur.atol === null ? 'not given' : JSON.stringify(cur.atol)} (now)`);
  if (base.stepgauge !== cur.stepgauge) differences.push(`stepgauge ${base.stepgauge} (baseline) vs ${cur.stepgauge} (now)`);
  const baseHash = new Map(base.methods.map((m) => [m.id, m.sha256]));
  const changed = cur.methods.filter((m) => baseHash.has(m.id) && baseHash.get(m.id) !== null && m.sha256 !== null && baseHash.get(m.id) !== m.sha256).map((m) => m.id);
  if (changed.length > 0) differences.push(`method code changed: ${changed.join(', ')} (compared: that change is what the gate checks)`);
  const limit = Math.min(base.maxSteps ?? Infinity, cur.maxSteps ?? Infinity);
  return {
    differences,
    comparable(b, c) {
      if (controllerDiffers && family.get(b.method) === 'embedded-explicit') return 'the step-size controller differs and this method uses it';
      if (limitDiffers) {
        // Under both limits a run's steps are the same computation; at either limit they are not.
        const steps = Math.max(b.counts.accepted + b.counts.rejected, c.counts.accepted + c.counts.rejected);
        if (b.status === 'step-limit' || c.status === 'step-limit' || steps >= limit) return 'the step limit differs and this run reached the lower one';
      }
      return null;
    },
  };
}
