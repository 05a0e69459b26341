// Fields both file kinds share: span, check times, error scale, invariants, tolerance scale.
import type { ErrorScale, Invariant, ReferencePoint } from '../../core/types.js';
import { fail, type Site } from '../file/fail.js';
import type { FieldPath } from '../file/read-structured.js';
import { constantValue } from './constants.js';

type Expr = string | number;

export function readSpan(site: Site, span: readonly [Expr, Expr], parameters: ReadonlyMap<string, number>): { t0: number; tEnd: number } {
  const t0 = constantValue(site, ['span', 0], span[0], parameters);
  const tEnd = constantValue(site, ['span', 1], span[1], parameters);
  if (!(tEnd > t0)) {
    fail(site, ['span'], `span [${t0}, ${tEnd}] is ${tEnd === t0 ? 'empty' : 'reversed'}; the end must be later than the start`);
  }
  return { t0, tEnd };
}

export function readCheckTimes(site: Site, times: readonly Expr[] | undefined, t0: number, tEnd: number, parameters: ReadonlyMap<string, number>): number[] {
  const out = (times ?? []).map((v, k) => {
    const t = constantValue(site, ['checkTimes', k], v, parameters);
    if (!(t > t0 && t <= tEnd)) fail(site, ['checkTimes', k], `check time ${t} is outside the span (${t0}, ${tEnd}]`);
    return t;
  });
  return [...new Set(out)].sort((a, b) => a - b);
}

export interface ErrorFields {
  readonly measure?: 'states' | 'outputs' | undefined;
  readonly scale?: 'absolute' | 'relative' | undefined;
  readonly floor?: number | number[] | Record<string, number> | undefined;
}

/** Error scale over the measured components (states or outputs, by name and order). */
export function readErrorScale(site: Site, spec: ErrorFields | undefined, components: readonly string[]): ErrorScale {
  const path: FieldPath = ['error'];
  if ((spec?.scale ?? 'absolute') === 'absolute') {
    if (spec?.floor !== undefined) fail(site, [...path, 'floor'], 'a floor applies only to scale: relative');
    return { kind: 'absolute' };
  }
  const floor = spec!.floor;
  if (floor === undefined) fail(site, path, 'scale: relative needs a floor (a positive number, one per component, or one per name)');
  if (typeof floor === 'number') return { kind: 'relative', floor };
  if (Array.isArray(floor)) {
    if (floor.length !== components.length) fail(site, [...path, 'floor'], `has ${floor.length} entries; the measured components are ${components.length} (${components.join(', ')})`);
    return { kind: 'relative', floor };
  }
  for (const key of Object.keys(floor)) {
    if (!components.includes(key)) fail(site, [...path, 'floor', key], `'${key}' is not a measured component (${components.join(', ')})`);
  }
  const missing = components.find((c) => !(c in floor));
  if (missing) fail(site, [...path, 'floor'], `no floor for '${missing}'`);
  return { kind: 'relative', floor: components.map((c) => floor[c]!) };
}


/** `reference.at`: rows of { t, <state>: value }, every state given, times inside the span. */
export function readReferencePoints(site: Site, rows: readonly Record<string, number>[], states: readonly string[], t0: number, tEnd: number): ReferencePoint[] {
  const points = rows.map((row, k) => {
    if (typeof row['t'] !== 'number') fail(site, ['reference', 'at', k], 'needs a time `t`');
    const t = row['t'];
    if (!(t > t0 && t <= tEnd)) fail(site, ['reference', 'at', k, 't'], `time ${t} is outside the span (${t0}, ${tEnd}]`);
    for (const key of Object.keys(row)) if (key !== 't' && !states.includes(key)) fail(site, ['reference', 'at', k, key], `'${key}' is not a state (states: ${states.join(', ')})`);
    const missing = states.find((s) => typeof row[s] !== 'number');
    if (missing) fail(site, ['reference', 'at', k], `no value for state '${missing}'`);
    return { t, y: states.map((s) => row[s]!) };
  });
  return points.sort((a, b) => a.t - b.t);
}

export type { Invariant };
