// Turning the user's --problem and --method lists into problem and method objects.
import { resolve as resolvePath } from 'node:path';
import type { Method, Problem } from '../core/types.js';
import { InputError } from '../core/errors.js';
import { closestNames } from '../core/names.js';
import { METHOD_ALIASES } from '../methods/aliases.js';
import { builtinMethods } from '../methods/registry.js';
import { catalogue } from '../../problems/index.js';
import { certificateCached, certificationPlan, needsCertificate, withCertifiedReference, withoutReference } from '../measure/certify.js';
import { uniformProblem } from '../problems/uniform.js';
import { sampleId, sampleNumber, type SampleSet } from '../problems/dispersion/expand.js';

/** The file entries of a comma list (built-in ids left out). */
export function fileEntries(list: string | undefined): string[] {
  return splitList(list).filter(looksLikePath);
}

/** True when a list entry names a file rather than a built-in id. */
export function looksLikePath(entry: string): boolean {
  return /[\\/]/.test(entry) || /\.(ya?ml|json|[cm]?[jt]s)$/i.test(entry);
}

function splitList(list: string | undefined): string[] {
  if (list === undefined) return [];
  return list
    .split(',')
    .map((s) => s.trim())
    .filter((s) => s.length > 0);
}

function unknown(kind: string, flag: string, id: string, known: string[], aliases: readonly string[] = []): InputError {
  const near = closestNames(id, [...known, ...aliases]);
  const hint = near.length > 0 ? `did you mean ${near.map((n) => `'${n}'`).join(' or ')}? ` : '';
  return new InputError(`unknown ${kind} '${id}'; ${hint}expected one of: ${known.join(', ')} (or a file path)`, flag);
}

export interface Resolved<T> {
  items: T[];
  /** True when the user named the entries (not the default "all"). */
  named: boolean;
  /** id -> the list entry that produced it (a path for user files), so workers can load it again. */
  entries: Map<string, string>;
}

interface ListKind<T extends { id: string }> {
  /** "problem" or "method", for messages. */
  noun: string;
  flag: string;
  builtins: readonly T[];
  /** Made of a built-in before use (a catalogue problem whose reference is certified gets it here). */
  prepare?: (item: T) => T;
  /** Other names (lower case) -> built-in id. */
  aliases?: Readonly<Record<string, string>>;
  /** The item of a file (a dispersion's is its set of samples). */
  load(path: string): Promise<T>;
}

/** The entries of a comma list: built-in ids, or files loaded by `kind.load`. */
async function resolveList<T extends { id: string }>(list: string | undefined, kind: ListKind<T>): Promise<Resolved<T>> {
  const entries = splitList(list);
  if (list !== undefined && entries.length === 0) {
    throw new InputError(`expected a comma-separated list of ${kind.noun} ids or files`, kind.flag);
  }
  const prepare = kind.prepare ?? ((x: T) => x);
  if (entries.length === 0) return { items: kind.builtins.map(prepare), named: false, entries: new Map() };
  const items: T[] = [];
  const sources = new Map<string, string>();
  for (const entry of entries) {
    if (looksLikePath(entry)) {
      const item = await kind.load(entry);
      items.push(item);
      sources.set(item.id, entry);
      continue;
    }
    // Ids match whatever the case; a published alias stands for its method.
    const typed = entry.toLowerCase();
    const id = kind.aliases?.[typed] ?? typed;
    const item = kind.builtins.find((c) => c.id.toLowerCase() === id);
    if (!item) throw unknown(kind.noun, kind.flag, entry, kind.builtins.map((c) => c.id), Object.keys(kind.aliases ?? {}));
    items.push(prepare(item));
  }
  assertUnique(items.map((x) => x.id), kind.flag);
  return { items, named: true, entries: sources };
}

/** Built samples kept per set: a lane runs a sample's settings one after another, so a few suffice. */
const KEPT_SAMPLES = 16;

/**
 * The problems of a --problem list as sources: ready problems, and dispersions whose samples are
 * built (and certified, and given the uniform layout) only when asked for by id.
 */
export interface ProblemSources {
  /** Ready problems and sample sets, in list order. */
  sources: (Problem | SampleSource)[];
  named: boolean;
  /** Entry (id or path) of each ready problem and of each sample set, by id (a set by its `of`). */
  entries: Map<string, string>;
  /** The problem `id`, a sample built now unless one of the last few built (throws when unknown). */
  get(id: string): Problem;
}

/** A dispersion's samples, each built when asked for (see SampleSet). */
export interface SampleSource {
  kind: 'samples';
  /** Stands for the samples in the list: `<of>-s1..<count>` (no problem id has dots). */
  id: string;
  set: SampleSet;
  entry: string;
  /** Sample k as the sweep runs it: certified where it needs to be, in the uniform layout. */
  sample(k: number): Problem;
}

export function isSampleSource(x: Problem | SampleSource): x is SampleSource {
  return (x as SampleSource).kind === 'samples';
}

/**
 * The problems of a --problem list, samples left to be built on demand. `uncertified` maps a file
 * (absolute path) to the reason its reference is not to be certified here (certification on a
 * worker ran out of time): such a problem keeps no reference, like one whose certification failed.
 */
export async function problemSources(
  list: string | undefined,
  warn: (message: string) => void = () => {},
  uncertified?: ReadonlyMap<string, string>,
  note: (message: string) => void = () => {},
): Promise<ProblemSources> {
  // Certification is two tight solves and can take a while: say what happens and how long it took.
  // A sample may be built more than once (see SampleSource): what is said about it is said once.
  const said = new Set<string>();
  const certified = (entry: string, x: Problem, skipped?: string): Problem => {
    const first = !said.has(x.id);
    said.add(x.id);
    const label = `${entry}${x.dispersion ? ` (${x.id})` : ''}`;
    const fresh = skipped === undefined && needsCertificate(x) && !certificateCached(x);
    if (fresh) note(`${label}: no reference given; certifying one (${certificationPlan(x)})`);
    const started = performance.now();
    const p = skipped !== undefined ? withoutReference(x, skipped) : withCertifiedReference(x);
    if (fresh && !p.reference.unavailable) note(`${label}: certified in ${((performance.now() - started) / 1000).toFixed(1)} s: ${p.reference.source ?? ''}`);
    if (first && p.reference.unavailable) warn(`${label}: ${p.reference.unavailable}`);
    if (first && p.reference.untrusted) warn(`warning: ${p.reference.untrusted}; its errors are not measured`);
    return uniformProblem(p);
  };
  const resolved = await resolveList<Problem | SampleSource>(list, {
    noun: 'problem',
    flag: '--problem',
    builtins: catalogue,
    // A catalogue problem whose reference stepgauge certifies (leo-j2, say) gets it like a file's.
    prepare: (p) => (needsCertificate(p as Problem) ? certified(p.id, p as Problem) : p),
    async load(entry) {
      const { loadUserProblem } = await import('./user-files.js');
      const loaded = await loadUserProblem(entry);
      const skipped = uncertified?.get(resolvePath(entry));
      if (!isSampleSet(loaded)) return certified(entry, loaded, skipped);
      return { kind: 'samples', id: `${sampleId(loaded.of, 1)}..${loaded.count}`, set: loaded, entry, sample: (k: number) => certified(entry, loaded.sample(k), skipped) };
    },
  });
  const ready = new Map<string, Problem>();
  const sets = new Map<string, SampleSource>();
  for (const x of resolved.items) {
    if (isSampleSource(x)) sets.set(x.set.of, x);
    else ready.set(x.id, x);
  }
  const kept = new Map<string, Problem>();
  const get = (id: string): Problem => {
    const p = ready.get(id) ?? kept.get(id);
    if (p) return p;
    for (const [of, source] of sets) {
      const k = sampleNumber(of, id);
      if (k === null || k > source.set.count) continue;
      const built = source.sample(k);
      if (kept.size >= KEPT_SAMPLES) kept.delete(kept.keys().next().value!);
      kept.set(id, built);
      return built;
    }
    throw new Error(`the --problem list yields no problem '${id}'`);
  };
  return { sources: resolved.items, named: resolved.named, entries: resolved.entries, get };
}

function isSampleSet(x: Problem | SampleSet): x is SampleSet {
  return typeof (x as SampleSet).sample === 'function' && typeof (x as SampleSet).count === 'number';
}

/** Every problem of the sources, samples built one after another (`each` sees each one). */
export function* everyProblem(sources: ProblemSources): Generator<Problem> {
  for (const x of sources.sources) {
    if (!isSampleSource(x)) yield x;
    else for (let k = 1; k <= x.set.count; k++) yield x.sample(k);
  }
}

/**
 * The problems of a --problem list, every sample of a dispersion built (choose runs them all);
 * see problemSources for `uncertified`.
 */
export async function resolveProblems(
  list: string | undefined,
  warn: (message: string) => void = () => {},
  uncertified?: ReadonlyMap<string, string>,
  note: (message: string) => void = () => {},
): Promise<Resolved<Problem>> {
  const sources = await problemSources(list, warn, uncertified, note);
  const items = [...everyProblem(sources)];
  assertUnique(items.map((x) => x.id), '--problem');
  return { items, named: sources.named, entries: problemEntries(sources) };
}

/** Entry (id or path) by problem id, every sample of a set included. */
export function problemEntries(sources: ProblemSources): Map<string, string> {
  const entries = new Map<string, string>();
  for (const x of sources.sources) {
    if (!isSampleSource(x)) {
      const entry = sources.entries.get(x.id);
      if (entry !== undefined) entries.set(x.id, entry);
    } else for (let k = 1; k <= x.set.count; k++) entries.set(sampleId(x.set.of, k), x.entry);
  }
  return entries;
}

export async function resolveMethods(list: string | undefined): Promise<Resolved<Method>> {
  return resolveList(list, {
    noun: 'method',
    flag: '--method',
    builtins: builtinMethods(),
    aliases: METHOD_ALIASES,
    async load(entry) {
      const { loadUserMethod } = await import('./user-files.js');
      return loadUserMethod(entry);
    },
  });
}

function assertUnique(ids: string[], flag: string): void {
  const seen = new Set<string>();
  for (const id of ids) {
    if (seen.has(id)) throw new InputError(`'${id}' is listed twice`, flag);
    seen.add(id);
  }
}
