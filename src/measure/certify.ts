// Certified references for problems without an exact or published one: two different high-order
// methods at very tight tolerance; the digits on which they agree become the reference's trust.
// Cached on disk by the problem's hash, so a sweep (and each worker) certifies a problem once.
import { existsSync, mkdirSync, readFileSync, renameSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import type { Method, Problem, ReferencePoint } from '../core/types.js';
import { sha256 } from '../core/hash.js';
import { absoluteTolerance } from '../core/tolerance.js';
import { findMethod } from '../methods/registry.js';
import { scaleFloors, scaledMaxError } from './error-norm.js';

/** Tolerances of the two certifying runs: near the limit of double precision for such pairs. */
const CERTIFY_RTOL_NONSTIFF = 1e-13;
const CERTIFY_RTOL_STIFF = 1e-12;
const CERTIFY_MAX_STEPS = 5_000_000;
/** Digits are capped where double precision ends. */
const MAX_DIGITS = 15;
/** Check times added when a problem names none, so error.max means something. */
const DEFAULT_CHECK_POINTS = 10;

const PAIRS = {
  nonstiff: ['dormand-prince-853', 'verner-65'],
  stiff: ['radau-iia-5', 'bdf-variable'],
} as const;

export interface Certificate {
  points: ReferencePoint[];
  digits: number;
  methods: [string, string];
  rtol: number;
}

export function cacheDir(): string {
  return process.env.STEPGAUGE_CACHE ?? join(process.cwd(), '.stepgauge-cache');
}

export function needsCertificate(p: Problem): boolean {
  return p.reference.kind === 'certified' && !p.reference.exact && (p.reference.points?.length ?? 0) === 0;
}

function certifyTimes(p: Problem): number[] {
  const times = p.checkTimes.length > 0 ? [...p.checkTimes] : evenTimes(p);
  if (times.at(-1) !== p.tEnd) times.push(p.tEnd);
  return times;
}

function evenTimes(p: Problem): number[] {
  const out: number[] = [];
  for (let k = 1; k < DEFAULT_CHECK_POINTS; k++) out.push(p.t0 + ((p.tEnd - p.t0) * k) / DEFAULT_CHECK_POINTS);
  return out;
}

function sampleAt(p: Problem, method: Method, rtol: number, times: number[]): number[][] {
  const want = new Set(times);
  const rows = new Map<number, number[]>();
  const result = method.solve(
    p,
    { rtol, atol: absoluteTolerance(p, rtol) },
    { maxSteps: CERTIFY_MAX_STEPS, checkTimes: times.filter((t) => t !== p.tEnd), observer: (t, y) => void (want.has(t) && rows.set(t, Array.from(y))) },
  );
  if (result.status !== 'ok') {
    throw new Error(`certifying ${p.id}: ${method.id} at rtol ${rtol} ended with ${result.status}${result.message ? ` (${result.message})` : ''}`);
  }
  rows.set(p.tEnd, Array.from(result.yFinal));
  return times.map((t) => {
    const row = rows.get(t);
    if (!row) throw new Error(`certifying ${p.id}: ${method.id} did not land on t = ${t}`);
    return row;
  });
}

export function certify(p: Problem): Certificate {
  const [idA, idB] = p.stiff ? PAIRS.stiff : PAIRS.nonstiff;
  const a = findMethod(idA);
  const b = findMethod(idB);
  if (!a || !b) throw new Error(`certifying ${p.id} needs methods ${idA} and ${idB}`);
  const rtol = p.stiff ? CERTIFY_RTOL_STIFF : CERTIFY_RTOL_NONSTIFF;
  const times = certifyTimes(p);
  const ya = sampleAt(p, a, rtol, times);
  const yb = sampleAt(p, b, rtol, times);
  // Agreement is measured in the problem's own error scale, relative per component with the
  // problem's floor, or relative to the state's size for absolute scales.
  const floors = scaleFloors(p.errorScale, p.dimension);
  let worst = 0;
  times.forEach((_, k) => {
    const ref = ya[k]!;
    let e = scaledMaxError(yb[k]!, ref, floors, p.dimension);
    if (!floors) e /= Math.max(1e-300, ...ref.map(Math.abs));
    worst = Math.max(worst, e);
  });
  const digits = worst === 0 ? MAX_DIGITS : Math.max(0, Math.min(MAX_DIGITS, Math.floor(-Math.log10(worst))));
  return { points: times.map((t, k) => ({ t, y: ya[k]! })), digits, methods: [idA, idB], rtol };
}

/**
 * The problem with its certified reference filled in (from the cache when present). When
 * certification fails (the model diverges at tight tolerance, say) the problem keeps no reference
 * and says why, so its runs are recorded as failed while the rest of the sweep goes on.
 */
export function withCertifiedReference(p: Problem): Problem {
  if (!needsCertificate(p)) return p;
  try {
    return certified(p);
  } catch (e) {
    return withoutReference(p, `could not certify a reference for ${p.id}: ${e instanceof Error ? e.message : String(e)}`);
  }
}

/** The problem marked as having no reference, and why (a problem that needs none is kept as is). */
export function withoutReference(p: Problem, why: string): Problem {
  if (!needsCertificate(p)) return p;
  return { ...p, reference: { kind: 'certified', points: [], unavailable: why } };
}

function certificateFile(p: Problem): string {
  return join(cacheDir(), `certified-${sha256(p.definition)}.json`);
}

/** Whether a certificate for this exact definition is already in the cache. */
export function certificateCached(p: Problem): boolean {
  return existsSync(certificateFile(p));
}

/** What certifying `p` will do, in words (for the note said before it starts). */
export function certificationPlan(p: Problem): string {
  const [a, b] = p.stiff ? PAIRS.stiff : PAIRS.nonstiff;
  const rtol = p.stiff ? CERTIFY_RTOL_STIFF : CERTIFY_RTOL_NONSTIFF;
  return `${a} and ${b} at rtol ${rtol}; the digits on which they agree become its trust; cached in ${cacheDir()}`;
}

function certified(p: Problem): Problem {
  const dir = cacheDir();
  const file = certificateFile(p);
  let cert: Certificate | undefined;
  if (existsSync(file)) {
    try {
      cert = JSON.parse(readFileSync(file, 'utf8')) as Certificate;
    } catch {
      cert = undefined; // a damaged cache entry is recomputed
    }
  }
  if (!cert) {
    cert = certify(p);
    mkdirSync(dir, { recursive: true });
    const tmp = `${file}.${process.pid}.tmp`;
    writeFileSync(tmp, JSON.stringify(cert));
    renameSync(tmp, file);
  }
  const checkTimes = cert.points.map((q) => q.t).filter((t) => t !== p.tEnd);
  return {
    ...p,
    checkTimes,
    reference: {
      kind: 'certified',
      digits: cert.digits,
      points: cert.points,
      certifiedBy: { methods: [...cert.methods], rtol: cert.rtol },
      source: `certified by stepgauge: ${cert.methods[0]} and ${cert.methods[1]} at rtol ${cert.rtol} agree to ${cert.digits} digits`,
    },
  };
}
