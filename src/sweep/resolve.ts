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
  /** One item, or several (a dispersion yields one problem per sample). */
  load(path: string): Promise<T | T[]>;
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
      const loaded = await kind.load(entry);
      for (const item of Array.isArray(loaded) ? loaded : [loaded]) {
        items.push(item);
        sources.set(item.id, entry);
      }
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

/**
 * The problems of a --problem list. `uncertified` maps a file (absolute path) to the reason its
 * reference is not to be certified here (certification on a worker ran out of time): such a
 * problem keeps no reference, like one whose certification failed.
 */
export async function resolveProblems(
  list: string | undefined,
  warn: (message: string) => void = () => {},
  uncertified?: ReadonlyMap<string, string>,
  note: (message: string) => void = () => {},
): Promise<Resolved<Problem>> {
  // Certification is two tight solves and can take a while: say what happens and how long it took.
  const certified = (entry: string, x: Problem, skipped?: string): Problem => {
    const label = `${entry}${x.dispersion ? ` (${x.id})` : ''}`;
    const fresh = skipped === undefined && needsCertificate(x) && !certificateCached(x);
    if (fresh) note(`${label}: no reference given; certifying one (${certificationPlan(x)})`);
    const started = performance.now();
    const p = skipped !== undefined ? withoutReference(x, skipped) : withCertifiedReference(x);
    if (fresh && !p.reference.unavailable) note(`${label}: certified in ${((performance.now() - started) / 1000).toFixed(1)} s: ${p.reference.source ?? ''}`);
    if (p.reference.unavailable) warn(`${label}: ${p.reference.unavailable}`);
    if (p.reference.untrusted) warn(`warning: ${p.reference.untrusted}; its errors are not measured`);
    return uniformProblem(p);
  };
  return resolveList(list, {
    noun: 'problem',
    flag: '--problem',
    builtins: catalogue,
    // A catalogue problem whose reference stepgauge certifies (leo-j2, say) gets it like a file's.
    prepare: (p) => (needsCertificate(p) ? certified(p.id, p) : p),
    async load(entry) {
      const { loadUserProblem } = await import('./user-files.js');
      const loaded = await loadUserProblem(entry);
      const skipped = uncertified?.get(resolvePath(entry));
      const one = (x: Problem): Problem => certified(entry, x, skipped);
      return Array.isArray(loaded) ? loaded.map(one) : one(loaded);
    },
  });
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
