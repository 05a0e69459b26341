// Turning the user's --problem and --method lists into problem and method objects.
import type { Method, Problem } from '../core/types.js';
import { InputError } from '../core/errors.js';
import { builtinMethods } from '../methods/registry.js';
import { catalogue } from '../../problems/index.js';
import { withCertifiedReference } from '../measure/certify.js';

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

function unknown(kind: string, flag: string, id: string, known: string[]): InputError {
  return new InputError(`unknown ${kind} '${id}'; expected one of: ${known.join(', ')} (or a file path)`, flag);
}

export interface Resolved<T> {
  items: T[];
  /** True when the user named the entries (not the default "all"). */
  named: boolean;
  /** id -> the list entry that produced it (a path for user files), so workers can load it again. */
  entries: Map<string, string>;
}

export async function resolveProblems(list: string | undefined, warn: (message: string) => void = () => {}): Promise<Resolved<Problem>> {
  const entries = splitList(list);
  if (list !== undefined && entries.length === 0) throw new InputError('expected a comma-separated list of problem ids or files', '--problem');
  if (entries.length === 0) return { items: [...catalogue], named: false, entries: new Map() };
  const items: Problem[] = [];
  const sources = new Map<string, string>();
  for (const entry of entries) {
    if (looksLikePath(entry)) {
      const { loadUserProblem } = await import('./user-files.js');
      const p = withCertifiedReference(await loadUserProblem(entry));
      if (p.reference.unavailable) warn(`${entry}: ${p.reference.unavailable}`);
      items.push(p);
      sources.set(p.id, entry);
      continue;
    }
    const p = catalogue.find((c) => c.id === entry);
    if (!p) throw unknown('problem', '--problem', entry, catalogue.map((c) => c.id));
    items.push(p);
  }
  assertUnique(items.map((p) => p.id), '--problem');
  return { items, named: true, entries: sources };
}

export async function resolveMethods(list: string | undefined): Promise<Resolved<Method>> {
  const all = builtinMethods();
  const entries = splitList(list);
  if (list !== undefined && entries.length === 0) throw new InputError('expected a comma-separated list of method ids or files', '--method');
  if (entries.length === 0) return { items: all, named: false, entries: new Map() };
  const items: Method[] = [];
  const sources = new Map<string, string>();
  for (const entry of entries) {
    if (looksLikePath(entry)) {
      const { loadUserMethod } = await import('./user-files.js');
      const m = await loadUserMethod(entry);
      items.push(m);
      sources.set(m.id, entry);
      continue;
    }
    const m = all.find((c) => c.id === entry);
    if (!m) throw unknown('method', '--method', entry, all.map((c) => c.id));
    items.push(m);
  }
  assertUnique(items.map((m) => m.id), '--method');
  return { items, named: true, entries: sources };
}

function assertUnique(ids: string[], flag: string): void {
  const seen = new Set<string>();
  for (const id of ids) {
    if (seen.has(id)) throw new InputError(`'${id}' is listed twice`, flag);
    seen.add(id);
  }
}
