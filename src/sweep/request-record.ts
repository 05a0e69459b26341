// A sweep request as a journal or results.json saves it (`request`), read back for --resume under
// the rules a fresh request obeys (core/setting.ts for tolerances and step counts), so a damaged
// or hand-edited record fails with its field named instead of steering the sweep.
import { requestedRtolProblem, requestedStepsProblem } from '../core/setting.js';
import { Validator } from '../results/validate.js';
import { MAX_RUN_TIMEOUT_SECONDS } from '../core/defaults.js';
import { CONTROLLER_KINDS, type ControllerKind } from '../core/types.js';
import type { SweepRequest } from './run.js';

/** A recorded request: its inputs are whatever an older or newer stepgauge wrote, checked before use (sweep/inputs.ts). */
export type ResumableRequest = Omit<SweepRequest, 'inputs'> & { inputs?: unknown };

export function requestFromRecord(record: unknown, where: string): ResumableRequest {
  const v = new Validator(where);
  const r = v.object(record, 'request');
  const req: ResumableRequest = {};
  if (r.problem !== undefined) req.problem = v.string(r.problem, 'request.problem');
  if (r.method !== undefined) req.method = v.string(r.method, 'request.method');
  /** A list of numbers, each held to the rule a fresh request's flag holds it to. */
  const checkedList = (value: unknown, field: string, problemOf: (x: number) => string | null): number[] =>
    v.array(value, field).map((x, i) => {
      const n = v.number(x, `${field}[${i}]`);
      const problem = problemOf(n);
      if (problem) v.fail(`${field}[${i}]`, problem);
      return n;
    });
  if (r.tolerances !== undefined) req.tolerances = checkedList(r.tolerances, 'request.tolerances', requestedRtolProblem);
  if (r.steps !== undefined) req.steps = checkedList(r.steps, 'request.steps', requestedStepsProblem);
  if (r.maxSteps !== undefined) req.maxSteps = v.integer(r.maxSteps, 'request.maxSteps', 1);
  if (r.timing === null) req.timing = null;
  else if (r.timing !== undefined) {
    const t = v.object(r.timing, 'request.timing');
    req.timing = { budgetSeconds: v.positive(t.budgetSeconds, 'request.timing.budgetSeconds'), minSamples: v.integer(t.minSamples, 'request.timing.minSamples', 1) };
  }
  if (r.controller !== undefined) {
    if (!CONTROLLER_KINDS.includes(r.controller as ControllerKind)) v.fail('request.controller', `is ${JSON.stringify(r.controller)}, expected ${CONTROLLER_KINDS.join(', ')}`);
    req.controller = r.controller as ControllerKind;
  }
  if (r.runTimeoutSeconds !== undefined) {
    req.runTimeoutSeconds = v.positive(r.runTimeoutSeconds, 'request.runTimeoutSeconds');
    // As --run-timeout (cli/options.ts): a longer one overflows Node's timers.
    if (req.runTimeoutSeconds > MAX_RUN_TIMEOUT_SECONDS) v.fail('request.runTimeoutSeconds', `is ${req.runTimeoutSeconds}, expected at most ${MAX_RUN_TIMEOUT_SECONDS} (a day)`);
  }
  if (r.shard !== undefined) {
    const s = v.object(r.shard, 'request.shard');
    const count = v.integer(s.count, 'request.shard.count', 1);
    const index = v.integer(s.index, 'request.shard.index', 1);
    if (index > count) v.fail('request.shard.index', `is ${index}, expected at most the shard count ${count}`);
    req.shard = { index, count };
  }
  if (r.inputs !== undefined) req.inputs = r.inputs;
  return req;
}
