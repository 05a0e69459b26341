// The program protocol, version 1 (docs/programs.md, schema/program-request.schema.json and
// schema/program-response.schema.json): the request stepgauge writes, and the reading of what a
// program answers (a JSON response, or CSV from a program that ignores its input).
import type { Problem, Setting, Status } from '../../core/types.js';
import { isAdaptiveSetting } from '../../core/types.js';
import { readEventTimes, requestEvents } from './event-times.js';

export const PROTOCOL_NAME = 'stepgauge-program';
export const PROTOCOL_VERSION = 1;

export interface ProgramRequest {
  protocol: typeof PROTOCOL_NAME;
  version: typeof PROTOCOL_VERSION;
  problem: { id: string; states: string[]; t0: number; tEnd: number; y0: number[]; parameters: Record<string, number> };
  setting: { rtol: number; atol: number | number[] } | { steps: number; h: number };
  outputTimes: number[];
  /** The problem's events (name and direction), when it declares any: a program may report their crossing times. */
  events?: { name: string; direction: string }[];
}

export function stateNames(problem: Problem): string[] {
  return problem.stateNames ? [...problem.stateNames] : Array.from({ length: problem.dimension }, (_, i) => `y${i + 1}`);
}

/** The setting as the protocol states it: a step count comes with its step size. */
export function protocolSetting(problem: Problem, setting: Setting): ProgramRequest['setting'] {
  if (isAdaptiveSetting(setting)) return { rtol: setting.rtol, atol: typeof setting.atol === 'number' ? setting.atol : [...setting.atol] };
  return { steps: setting.steps, h: (problem.tEnd - problem.t0) / setting.steps };
}

export function buildRequest(problem: Problem, setting: Setting): ProgramRequest {
  const outputTimes = problem.checkTimes.filter((t) => t > problem.t0 && t < problem.tEnd);
  outputTimes.push(problem.tEnd);
  const events = requestEvents(problem);
  return {
    protocol: PROTOCOL_NAME,
    version: PROTOCOL_VERSION,
    problem: {
      id: problem.id,
      states: stateNames(problem),
      t0: problem.t0,
      tEnd: problem.tEnd,
      y0: [...problem.y0],
      parameters: { ...(problem.parameters ?? {}) },
    },
    setting: protocolSetting(problem, setting),
    outputTimes,
    ...(events.length > 0 ? { events } : {}),
  };
}

/** What a program reported, read and checked against the request. */
export interface ProgramOutput {
  status: Status;
  message?: string;
  /** Reported times, and the states there, row after row (times.length * n values). */
  times: Float64Array;
  states: Float64Array;
  counts?: { nfev: number; njev: number; nlu: number; accepted: number; rejected: number };
  seconds?: number;
  /** Crossing times the program located itself, by event name (optional `events` member). */
  events?: Record<string, number[]>;
}

export type Parsed = { ok: true; output: ProgramOutput } | { ok: false; status: Status; message: string };

const PROGRAM_STATUSES: readonly Status[] = ['ok', 'diverged', 'step-underflow', 'step-limit', 'error'];
const COUNT_FIELDS = ['nfev', 'njev', 'nlu', 'accepted', 'rejected'] as const;
/** How closely the first reported state must reproduce y0 (relative, floor 1): ten digits. */
const Y0_MATCH = 1e-10;
/** How closely the last reported time must reach tEnd, relative to the span. */
const END_MATCH = 1e-12;

function malformed(message: string): Parsed {
  return { ok: false, status: 'error', message: `malformed output: ${message}` };
}

/**
 * JSON allows no NaN or Infinity, but many languages' JSON writers print them: read them as null
 * (a non-finite value), so a diverged solution is reported as such rather than as malformed.
 */
function parseLenientJson(text: string): unknown {
  try {
    return JSON.parse(text);
  } catch (e) {
    const patched = text.replace(/(?<![\w."])-?(?:NaN|Infinity|inf|nan)(?![\w"])/g, 'null');
    if (patched === text) throw e;
    return JSON.parse(patched);
  }
}

function isRecord(v: unknown): v is Record<string, unknown> {
  return typeof v === 'object' && v !== null && !Array.isArray(v);
}

function toNumber(v: unknown): number | undefined {
  if (v === null) return NaN; // a non-finite value written as null (see parseLenientJson)
  return typeof v === 'number' ? v : undefined;
}

/** Reads a program's standard output: a JSON response, or CSV (`t,<state names>` header). */
export function parseOutput(text: string, problem: Problem): Parsed {
  const trimmed = text.trim();
  if (trimmed === '') return malformed('the program printed nothing');
  if (trimmed.startsWith('{')) return parseJsonResponse(trimmed, problem);
  return parseCsv(trimmed, problem);
}

function parseJsonResponse(text: string, problem: Problem): Parsed {
  let data: unknown;
  try {
    data = parseLenientJson(text);
  } catch (e) {
    return malformed(`not valid JSON (${(e as Error).message})`);
  }
  if (!isRecord(data)) return malformed('the response must be a JSON object');
  const status = data.status as Status;
  if (!PROGRAM_STATUSES.includes(status)) return malformed(`status must be one of ${PROGRAM_STATUSES.join(', ')}, got ${JSON.stringify(data.status)}`);
  const message = typeof data.message === 'string' && data.message ? data.message : undefined;
  const times = data.times ?? [];
  const states = data.states ?? [];
  if (!Array.isArray(times) || !Array.isArray(states)) return malformed('times and states must be arrays');
  if (times.length !== states.length) return malformed(`${times.length} times but ${states.length} states`);
  const n = problem.dimension;
  const ts = new Float64Array(times.length);
  const ys = new Float64Array(times.length * n);
  for (let k = 0; k < times.length; k++) {
    const t = toNumber(times[k]);
    if (t === undefined) return malformed(`times[${k}] is not a number`);
    ts[k] = t;
    const row = states[k];
    if (!Array.isArray(row) || row.length !== n) return malformed(`states[${k}] must be a list of ${n} numbers (${stateNames(problem).join(', ')})`);
    for (let i = 0; i < n; i++) {
      const v = toNumber(row[i]);
      if (v === undefined) return malformed(`states[${k}][${i}] is not a number`);
      ys[k * n + i] = v;
    }
  }
  const output: ProgramOutput = { status, times: ts, states: ys };
  if (message) output.message = message;
  if (data.counts !== undefined) {
    if (!isRecord(data.counts)) return malformed('counts must be an object');
    const counts = { nfev: 0, njev: 0, nlu: 0, accepted: 0, rejected: 0 };
    for (const f of COUNT_FIELDS) {
      const v = data.counts[f];
      if (v === undefined) continue;
      if (!Number.isInteger(v) || (v as number) < 0) return malformed(`counts.${f} must be a whole number >= 0`);
      counts[f] = v as number;
    }
    output.counts = counts;
  }
  if (data.seconds !== undefined) {
    if (typeof data.seconds !== 'number' || !(data.seconds >= 0) || !Number.isFinite(data.seconds)) return malformed('seconds must be a number >= 0');
    output.seconds = data.seconds;
  }
  if (data.events !== undefined) {
    const events = readEventTimes(data.events, problem);
    if (typeof events === 'string') return malformed(events);
    output.events = events;
  }
  return checkTrajectory(output, problem);
}

function parseCell(cell: string): number {
  const c = cell.trim().toLowerCase();
  if (/^[-+]?(nan|inf|infinity)$/.test(c)) return c.includes('nan') ? NaN : c.startsWith('-') ? -Infinity : Infinity;
  return c === '' ? Number.NaN : Number(c);
}

function parseCsv(text: string, problem: Problem): Parsed {
  const lines = text.split(/\r?\n/).filter((l) => l.trim() !== '');
  const names = stateNames(problem);
  const header = lines[0]!.split(',').map((s) => s.trim());
  const expected = ['t', ...names];
  if (header.length !== expected.length || header.some((h, i) => h !== expected[i])) {
    return malformed(`not a JSON response, and the first line is not the CSV header ${expected.join(',')} (got ${lines[0]!.slice(0, 80)})`);
  }
  const n = names.length;
  const rows = lines.length - 1;
  const ts = new Float64Array(rows);
  const ys = new Float64Array(rows * n);
  for (let k = 0; k < rows; k++) {
    const cells = lines[k + 1]!.split(',');
    if (cells.length !== n + 1) return malformed(`CSV line ${k + 2} has ${cells.length} values, expected ${n + 1}`);
    const t = Number(cells[0]!.trim());
    if (cells[0]!.trim() === '' || Number.isNaN(t)) return malformed(`CSV line ${k + 2}: t is not a number`);
    ts[k] = t;
    for (let i = 0; i < n; i++) {
      const v = parseCell(cells[i + 1]!);
      if (Number.isNaN(v) && !/nan/i.test(cells[i + 1]!)) return malformed(`CSV line ${k + 2}: ${names[i]} is not a number`);
      ys[k * n + i] = v;
    }
  }
  return checkTrajectory({ status: 'ok', times: ts, states: ys }, problem);
}

/**
 * The trajectory's own rules: it starts at t0 with y0, its times do not go back, a finished run
 * reaches tEnd, and a non-finite value ends the trajectory as `diverged`.
 */
function checkTrajectory(out: ProgramOutput, problem: Problem): Parsed {
  const n = problem.dimension;
  const count = out.times.length;
  const span = problem.tEnd - problem.t0;
  if (count === 0) {
    if (out.status === 'ok') return malformed('no times reported (they must start at t0 and include tEnd)');
    return { ok: true, output: out };
  }
  if (out.times[0] !== problem.t0) return malformed(`the first reported time is ${out.times[0]}, expected t0 = ${problem.t0}`);
  const names = stateNames(problem);
  for (let i = 0; i < n; i++) {
    const got = out.states[i]!;
    const want = problem.y0[i]!;
    if (!(Math.abs(got - want) <= Y0_MATCH * Math.max(1, Math.abs(want)))) {
      return { ok: false, status: 'error', message: `the state at t0 is not the requested y0: ${names[i]} = ${got}, expected ${want}` };
    }
  }
  for (let k = 1; k < count; k++) {
    if (!(out.times[k]! >= out.times[k - 1]!)) return malformed(`reported times go back (times[${k}] = ${out.times[k]} after ${out.times[k - 1]})`);
  }
  // A non-finite value: the trajectory ends before it, and the run has diverged.
  for (let k = 0; k < count; k++) {
    let finite = Number.isFinite(out.times[k]!);
    for (let i = 0; i < n && finite; i++) finite = Number.isFinite(out.states[k * n + i]!);
    if (!finite) {
      const at = out.times[k]!;
      return {
        ok: true,
        output: {
          ...out,
          status: 'diverged',
          message: `non-finite value reported at t = ${at}${out.status !== 'ok' && out.message ? ` (${out.message})` : ''}`,
          times: out.times.slice(0, k),
          states: out.states.slice(0, k * n),
        },
      };
    }
  }
  const last = out.times[count - 1]!;
  if (out.status === 'ok' && Math.abs(last - problem.tEnd) > END_MATCH * Math.abs(span)) {
    return { ok: false, status: 'error', message: `incomplete output: the last reported time is ${last}, the span ends at ${problem.tEnd}` };
  }
  return { ok: true, output: out };
}
