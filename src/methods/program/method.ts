// A user's own program as a method (family `external`): each solve sends one request through the
// program protocol and turns the answer into a solve result. The program's reported states are
// handed to the observer one by one, so the error is measured at every time the program reports.
import { createHash } from 'node:crypto';
import type { Counts, Method, Problem, Setting, SolveOptions, SolveResult, Status, TimeBasis } from '../../core/types.js';
import { isAdaptiveSetting, zeroCounts } from '../../core/types.js';
import { callHost } from './bridge.js';
import { substitute, type ProgramSpec } from './file.js';
import type { HostReply } from './host-messages.js';
import { buildRequest, parseOutput, protocolSetting, type ProgramOutput } from './protocol.js';

/** Per-run limit when neither the program file nor the command line gives one. */
export const DEFAULT_PROGRAM_TIMEOUT_SECONDS = 600;
/** At most this many lines of the program's error output are quoted in a run's message. */
const STDERR_LINES = 4;
const STDERR_LINE_CHARS = 200;
/** Start-up is measured as the fastest of this many trivial requests. */
const START_UP_SAMPLES = 2;

/** The last few lines of a program's error output, for a run's message ('' when it wrote none). */
export function quoteStderr(stderr: string): string {
  const lines = stderr
    .split(/\r?\n/)
    .map((l) => l.trimEnd())
    .filter((l) => l.trim() !== '');
  if (lines.length === 0) return '';
  const kept = lines.slice(-STDERR_LINES).map((l) => (l.length > STDERR_LINE_CHARS ? `${l.slice(0, STDERR_LINE_CHARS)}...` : l));
  return `; stderr${lines.length > STDERR_LINES ? ` (last ${STDERR_LINES} lines)` : ''}: ${kept.join(' | ')}`;
}

function settingKey(problem: Problem, setting: Setting): string {
  return `${problem.id}|${JSON.stringify(protocolSetting(problem, setting))}`;
}

function outputHash(out: ProgramOutput): string {
  const h = createHash('sha256');
  h.update(new Uint8Array(out.times.buffer, out.times.byteOffset, out.times.byteLength));
  h.update(new Uint8Array(out.states.buffer, out.states.byteOffset, out.states.byteLength));
  return h.digest('hex');
}

interface Exchange {
  reply: HostReply;
}

export function programMethod(spec: ProgramSpec): Method {
  const adaptive = spec.settings === 'tolerance';
  /** Seconds of the last solve per (problem, setting), kept for solveSeconds. */
  const lastSeconds = new Map<string, { seconds: number; basis: TimeBasis }>();
  /** Measured start-up per problem (wall time of a trivial request). */
  const startUp = new Map<string, number>();

  const exchange = (problem: Problem, setting: Setting, deadline: number | undefined): Exchange => {
    const request = buildRequest(problem, setting);
    const argv = substitute(spec.argv, request.setting as unknown as Record<string, number>);
    let timeoutMs = (spec.timeoutSeconds ?? DEFAULT_PROGRAM_TIMEOUT_SECONDS) * 1000;
    if (deadline !== undefined) timeoutMs = Math.max(1, Math.min(timeoutMs, deadline - performance.now()));
    const input = JSON.stringify(request);
    const reply =
      spec.protocol === 'lines'
        ? callHost({ op: 'line', key: `${spec.id}\u0000${argv.join('\u0000')}`, argv, cwd: spec.cwd, input, timeoutMs })
        : callHost({ op: 'once', argv, cwd: spec.cwd, input: `${input}\n`, timeoutMs });
    return { reply };
  };

  const failure = (problem: Problem, status: Status, message: string): SolveResult => ({
    status,
    message,
    tFinal: problem.t0,
    yFinal: Float64Array.from(problem.y0),
    counts: zeroCounts(),
    countsReported: false,
  });

  /** Wall time of the cheapest request there is for this problem: the program's start-up and I/O. */
  const startUpSeconds = (problem: Problem): number | null => {
    const known = startUp.get(problem.id);
    if (known !== undefined) return known;
    const trivial: Setting = adaptive ? { rtol: 0.1, atol: 0.1 } : { steps: 1 };
    let best = Infinity;
    for (let k = 0; k < START_UP_SAMPLES; k++) {
      const { reply } = exchange(problem, trivial, undefined);
      if (reply.kind !== 'finished' || reply.timedOut || reply.code !== 0) return null;
      best = Math.min(best, reply.wallSeconds);
    }
    startUp.set(problem.id, best);
    return best;
  };

  const solve = (problem: Problem, setting: Setting, options: SolveOptions): SolveResult => {
    if (isAdaptiveSetting(setting) !== adaptive) {
      return failure(problem, 'error', `${spec.id} takes ${adaptive ? 'a tolerance (rtol, atol)' : 'a step count'} (settings: ${spec.settings} in ${spec.file})`);
    }
    const { reply } = exchange(problem, setting, options.deadline);
    if (reply.kind !== 'finished') return failure(problem, 'error', `could not start ${spec.argv[0]}: ${reply.kind === 'not-started' ? reply.message : reply.kind}`);
    const stderr = quoteStderr(reply.stderr);
    if (reply.timedOut) {
      const limit = options.deadline !== undefined ? 'the run timeout' : `${spec.timeoutSeconds ?? DEFAULT_PROGRAM_TIMEOUT_SECONDS} s`;
      return failure(problem, 'timeout', `no answer within ${limit}; the program's process group was killed${stderr}`);
    }
    if (reply.closed) {
      const how = reply.signal ? `was killed by ${reply.signal}` : `exited with code ${reply.code}`;
      return failure(problem, 'error', `the kept program ${how} instead of answering${stderr}`);
    }
    if (reply.signal) return failure(problem, 'error', `the program crashed (${reply.signal})${stderr}`);
    if (reply.code !== 0) return failure(problem, 'error', `the program exited with code ${reply.code}${stderr}`);
    const parsed = parseOutput(reply.stdout, problem);
    if (!parsed.ok) return failure(problem, parsed.status, `${parsed.message}${stderr}`);
    const out = parsed.output;
    const n = problem.dimension;
    const count = out.times.length;
    const observer = options.observer;
    if (observer) {
      for (let k = 0; k < count; k++) observer(out.times[k]!, out.states.subarray(k * n, (k + 1) * n));
    }
    const counts: Counts = out.counts ? { ...out.counts } : zeroCounts();
    const result: SolveResult = {
      status: out.status,
      tFinal: count > 0 ? out.times[count - 1]! : problem.t0,
      yFinal: count > 0 ? out.states.slice((count - 1) * n, count * n) : Float64Array.from(problem.y0),
      counts,
      countsReported: out.counts !== undefined,
      reportedPoints: count,
      outputSha256: outputHash(out),
    };
    if (out.events) result.eventTimes = out.events;
    if (out.message) result.message = out.message;
    else if (out.status !== 'ok') result.message = `the program reported ${out.status}${stderr}`;
    if (!adaptive) result.h = (problem.tEnd - problem.t0) / (setting as { steps: number }).steps;
    if (out.status === 'ok') {
      if (out.seconds !== undefined) lastSeconds.set(settingKey(problem, setting), { seconds: out.seconds, basis: 'reported' });
      else {
        const base = startUpSeconds(problem);
        if (base !== null) lastSeconds.set(settingKey(problem, setting), { seconds: Math.max(0, reply.wallSeconds - base), basis: 'wall-minus-start-up' });
      }
    }
    return result;
  };

  return {
    id: spec.id,
    name: spec.name,
    family: 'external',
    // NaN when the program file states no order: reports show "not stated", plots draw no slope.
    order: spec.order ?? Number.NaN,
    source: spec.source ?? `user program (program file ${spec.file})`,
    adaptive,
    stiff: spec.stiff,
    roundTrip: false,
    notes: `external program run through the stepgauge-program protocol (${spec.protocol})`,
    program: { file: spec.file, sha256: spec.sha256, argv: spec.argv, protocol: spec.protocol, settings: spec.settings },
    solve,
    solveSeconds(problem, setting, options) {
      const key = settingKey(problem, setting);
      if (!lastSeconds.has(key)) solve(problem, setting, options);
      return lastSeconds.get(key) ?? null;
    },
  };
}
