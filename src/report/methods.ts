// What the report knows about each method: the optional `methods` list a sweep may add to the
// results file, with the bare id as the fallback name when it is absent.
import type { ResultsFile } from '../results/contract.js';

export interface MethodInfo {
  id: string;
  name: string;
  family: string | null;
  /** Published order, when the results file says it. */
  order: number | null;
}

export function methodInfo(results: ResultsFile): Map<string, MethodInfo> {
  const info = new Map<string, MethodInfo>();
  const listed = Array.isArray(results.methods) ? (results.methods as unknown[]) : [];
  for (const m of listed) {
    if (!m || typeof m !== 'object') continue;
    const o = m as Record<string, unknown>;
    if (typeof o.id !== 'string' || info.has(o.id)) continue;
    info.set(o.id, {
      id: o.id,
      name: typeof o.name === 'string' && o.name !== '' ? o.name : o.id,
      family: typeof o.family === 'string' ? o.family : null,
      order: typeof o.order === 'number' && Number.isFinite(o.order) ? o.order : null,
    });
  }
  for (const r of results.runs) {
    if (!info.has(r.method)) info.set(r.method, { id: r.method, name: r.method, family: null, order: null });
  }
  return info;
}
