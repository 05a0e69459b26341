// Builds a Problem from an equation file: checks every name and expression, orders definitions,
// compiles f, invariants, outputs and the exact reference to JavaScript, forms the symbolic
// Jacobian and finds (or checks) the separable split.
import { readUnits } from '../file/units.js';
import { basename } from 'node:path';
import type { OrbitStates, Reference, SeparableSplit } from '../../core/types.js';
import { DERIVATIVE_FUNCTIONS, USER_FUNCTIONS } from '../expression/functions.js';
import { ExpressionRejected, symbolsOf, type AstNode } from '../expression/emit.js';
import { parseExpression } from '../expression/parse.js';
import { canonicalJson } from '../file/canonical.js';
import { fail } from '../file/fail.js';
import type { FieldPath, StructuredFile } from '../file/read-structured.js';
import type { EquationFile } from '../file/schema.js';
import type { UserProblem } from '../user-problem.js';
import { compileJacobian, compileScalarFunction, compileTimeFunction, compileVectorFunction, neededDefinitions, type DefinitionCode } from './codegen.js';
import { readCheckTimes, readErrorScale, readReferencePoints, readSpan } from './common-fields.js';
import { constantValue, emitField, evaluateParameters } from './constants.js';
import { definitionOrderProblem } from './definition-order.js';
import { dependencyGraph, reachedStates } from './dependency-graph.js';
import { symbolicJacobian } from './jacobian.js';
import { expandVectors } from './vectors.js';
import { isolateTableCalls, type FileTables } from '../tables/file-tables.js';
import { detectedBand } from './band.js';
import { detectedPattern } from './pattern.js';
import { checkName, makeScope, MAX_FILE_STATES } from './names.js';
import { checkSeparableSplit, findSeparableSplit, secondOrderForm, type Dependencies } from './separable.js';

type Expr = string | number;

function keysMatchStates(site: StructuredFile, path: FieldPath, given: Record<string, Expr>, states: readonly string[], what: string): void {
  const known = new Set(states);
  for (const key of Object.keys(given)) {
    if (!known.has(key)) fail(site, [...path, key], `'${key}' is not a state (states: ${shortList(states)})`);
  }
  const missing = states.find((s) => !Object.hasOwn(given, s));
  if (missing !== undefined) fail(site, path, `state '${missing}' has no ${what}`);
}

/** A list of names for a one-line message: the first dozen, then how many more. */
function shortList(names: readonly string[]): string {
  return names.length <= 12 ? names.join(', ') : `${names.slice(0, 12).join(', ')} and ${names.length - 12} more`;
}

export function buildEquationProblem(site: StructuredFile, given: EquationFile, tables?: FileTables): UserProblem {
  const tableNames = new Set(tables ? tables.tables.keys() : []);
  const spec = isolateTableCalls(site, expandVectors(site, given), tableNames);
  const bindings = tables?.bindings;
  const functions = new Map([...USER_FUNCTIONS, ...(tables?.valueRules ?? [])]);
  const taken = new Map<string, string>();
  for (const name of tableNames) checkName(site, ['tables', name], name, taken, 'table');
  const states = spec.states;
  if (states.length > MAX_FILE_STATES) fail(site, ['states'], `lists ${states.length} states; a problem file may have at most ${MAX_FILE_STATES} (write a larger model as a problem module)`);
  states.forEach((s, i) => checkName(site, ['states', i], s, taken, 'state'));
  const n = states.length;
  const parameters = evaluateParameters(site, spec.parameters, (path, name) => checkName(site, path, name, taken, 'parameter'));

  // Definitions: parse all first, so order problems are reported before unknown symbols.
  const defSpecs = spec.definitions ?? {};
  const defNames = Object.keys(defSpecs);
  defNames.forEach((d) => checkName(site, ['definitions', d], d, taken, 'definition'));
  const defNodes = new Map<string, AstNode>();
  for (const d of defNames) {
    try {
      defNodes.set(d, parseExpression(defSpecs[d]!));
    } catch (e) {
      if (e instanceof ExpressionRejected) fail(site, ['definitions', d], e.message);
      throw e;
    }
  }
  const defUses = new Map(defNames.map((d) => [d, new Set([...symbolsOf(defNodes.get(d)!)].filter((s) => defNodes.has(s)))] as const));
  const orderProblem = definitionOrderProblem(defNames, defUses);
  if (orderProblem) fail(site, ['definitions', orderProblem.name], orderProblem.message);

  const definitions: DefinitionCode[] = [];
  const visibleDefs = new Map<string, number>();
  defNames.forEach((d, index) => {
    const scope = makeScope({ time: true, states, parameters, definitions: visibleDefs, functions });
    const { js, node } = emitField(site, ['definitions', d], defSpecs[d]!, scope);
    definitions.push({ index, name: d, js, uses: symbolsOf(node) });
    visibleDefs.set(d, index);
  });
  const fullScope = makeScope({ time: true, states, parameters, definitions: visibleDefs, functions });

  keysMatchStates(site, ['equations'], spec.equations, states, 'equation');
  const equations = states.map((s) => emitField(site, ['equations', s], spec.equations[s]!, fullScope));
  const eqSymbols = equations.flatMap((e) => [...symbolsOf(e.node)]);
  const f = compileVectorFunction(n, equations.map((e) => e.js), neededDefinitions(eqSymbols, definitions), bindings);

  keysMatchStates(site, ['initial'], spec.initial, states, 'initial value');
  const y0 = states.map((s) => constantValue(site, ['initial', s], spec.initial[s]!, parameters));
  const { t0, tEnd } = readSpan(site, spec.span, parameters);
  const listed = readCheckTimes(site, spec.checkTimes, t0, tEnd, parameters);
  // Breakpoints of tables of t: adaptive methods land on them instead of stepping over a kink.
  const kinks = (tables?.nonSmoothTimes ?? []).filter((x) => x > t0 && x < tEnd);
  const checkTimes = kinks.length ? [...new Set([...listed, ...kinks])].sort((a, b) => a - b) : listed;

  const invariants = Object.entries(spec.invariants ?? {}).map(([name, text]) => {
    const { js, node } = emitField(site, ['invariants', name], text, fullScope);
    return { name, fn: compileScalarFunction(n, js, neededDefinitions(symbolsOf(node), definitions), bindings) };
  });

  const events = Object.entries(spec.events ?? {}).map(([name, ev]) => {
    if (!/^[a-z0-9]+(-[a-z0-9]+)*$/.test(name)) fail(site, ['events', name], `event name '${name}' must be kebab-case`);
    const { js, node } = emitField(site, ['events', name, 'expression'], ev.expression, fullScope);
    return { name, direction: ev.direction ?? 'both', fn: compileScalarFunction(n, js, neededDefinitions(symbolsOf(node), definitions), bindings) };
  });
  const orbit = spec.orbit ? readOrbit(site, spec.orbit, states) : undefined;

  const outputNames = Object.keys(spec.outputs ?? {});
  const outputs = outputNames.length
    ? (() => {
        const code = outputNames.map((o) => emitField(site, ['outputs', o], spec.outputs![o]!, fullScope));
        const defs = neededDefinitions(code.flatMap((c) => [...symbolsOf(c.node)]), definitions);
        return { names: outputNames, fn: compileVectorFunction(n, code.map((c) => c.js), defs, bindings) };
      })()
    : undefined;

  const errorOn = spec.error?.measure ?? 'states';
  if (errorOn === 'outputs' && !outputs) fail(site, ['error', 'measure'], 'measure: outputs needs an `outputs` section');
  const errorScale = readErrorScale(site, spec.error, errorOn === 'outputs' ? outputNames : states);

  // Dependencies and the Jacobian both follow the definitions as a graph (never inlined).
  const graph = dependencyGraph(states, defNames.map((name) => ({ name, node: defNodes.get(name)! })));
  const reach = equations.map((e) => graph.reachOf(e.node));
  const dependencies: Dependencies = {
    names: states,
    deps: reach.map((r) => new Set(reachedStates(r))),
    usesTime: reach.map((r) => r.usesTime),
  };
  const found = separability(site, spec, dependencies);
  const bareState = equations.map((e) => bareStateOf(e.node, states));
  const separable = found.separable ? secondOrderForm(found.separable, bareState) : undefined;
  const separableReason = found.separableReason;
  const jacobianBand = detectedBand(dependencies.deps);
  const jacobianPattern = detectedPattern(dependencies.deps);

  const derivativeScope = makeScope({ time: true, states, parameters, definitions: visibleDefs, functions: new Map([...DERIVATIVE_FUNCTIONS, ...(tables?.valueRules ?? [])]) });
  const jac = symbolicJacobian(graph, equations.map((e) => e.node), derivativeScope, tables?.slopeRules);
  const jacobian = 'entries' in jac ? compileJacobian(n, jac.entries, neededDefinitions(eqSymbols, definitions), jac.temporaries, bindings) : undefined;

  return {
    id: spec.id,
    title: spec.title ?? spec.id,
    source: spec.source ?? `user problem file ${basename(site.file)} (no source named)`,
    description: spec.description ?? describe(states, spec.equations, defSpecs),
    dimension: n,
    stateNames: states,
    t0,
    tEnd,
    y0,
    f,
    ...(jacobian ? { jacobian } : {}),
    ...(jacobianBand ? { jacobianBand } : {}),
    ...(jacobianPattern ? { jacobianPattern } : {}),
    jacobianSource: jacobian ? 'symbolic' : 'finite-difference',
    ...('reason' in jac ? { jacobianNote: jac.reason } : {}),
    stiff: spec.stiff ?? false,
    invariants,
    errorScale,
    errorOn,
    ...(outputs ? { outputs } : {}),
    reference: readReference(site, spec, states, parameters, t0, tEnd),
    checkTimes,
    // A table's kinks in t are real non-smooth points: adaptive methods land on them.
    ...(spec.landOnCheckTimes || kinks.length > 0 ? { landOnCheckTimes: true } : {}),
    ...(separable ? { separable } : {}),
    ...(separableReason ? { separableReason } : {}),
    ...(spec.atolScale !== undefined ? { atolScale: spec.atolScale } : {}),
    ...(events.length ? { events } : {}),
    ...(orbit ? { orbit } : {}),
    ...(spec.units ? { units: readUnits(site, spec.units, states, outputNames) } : {}),
    parameters: Object.fromEntries(parameters),
    definition: canonicalJson(tables ? { file: site.data, tableValues: tables.canonical } : site.data),
    origin: site.file,
  };
}

function readOrbit(site: StructuredFile, o: NonNullable<EquationFile['orbit']>, states: readonly string[]): OrbitStates {
  const index = (field: 'position' | 'velocity', k: number): number => {
    const i = states.indexOf(o[field][k]!);
    if (i < 0) fail(site, ['orbit', field, k], `'${o[field][k]}' is not a state`);
    return i;
  };
  const position = [0, 1, 2].map((k) => index('position', k)) as [number, number, number];
  const velocity = [0, 1, 2].map((k) => index('velocity', k)) as [number, number, number];
  if (new Set([...position, ...velocity]).size !== 6) fail(site, ['orbit'], 'position and velocity need six different states');
  return { position, velocity, unit: o.unit };
}

/** The state an equation's text names alone (`vx`, `(vx)`), or null. */
function bareStateOf(node: unknown, states: readonly string[]): number | null {
  let n = node as { type?: string; name?: string; content?: unknown };
  while (n.type === 'ParenthesisNode') n = n.content as typeof n;
  if (n.type !== 'SymbolNode' || typeof n.name !== 'string') return null;
  const i = states.indexOf(n.name);
  return i >= 0 ? i : null;
}

function separability(site: StructuredFile, spec: EquationFile, d: Dependencies): { separable?: SeparableSplit; separableReason?: string } {
  if (spec.separable) {
    const index = (field: 'positions' | 'velocities', name: string, k: number): number => {
      const i = d.names.indexOf(name);
      if (i < 0) fail(site, ['separable', field, k], `'${name}' is not a state`);
      return i;
    };
    const positions = spec.separable.positions.map((s, k) => index('positions', s, k));
    const velocities = spec.separable.velocities.map((s, k) => index('velocities', s, k));
    const all = new Set([...positions, ...velocities]);
    if (all.size !== positions.length + velocities.length) fail(site, ['separable'], 'a state is listed more than once');
    if (all.size !== d.names.length) {
      fail(site, ['separable'], `every state must be a position or a velocity; missing ${d.names.filter((_, i) => !all.has(i)).join(', ')}`);
    }
    const split = { positions, velocities };
    const broken = checkSeparableSplit(d, split);
    if (broken) fail(site, ['separable'], `the split does not hold: ${broken}`);
    return { separable: split };
  }
  const found = findSeparableSplit(d);
  return 'split' in found ? { separable: found.split } : { separableReason: found.reason };
}

function readReference(site: StructuredFile, spec: EquationFile, states: readonly string[], parameters: ReadonlyMap<string, number>, t0: number, tEnd: number): Reference {
  const ref = spec.reference;
  if (!ref) return { kind: 'certified', points: [] };
  if (ref.exact && ref.at) fail(site, ['reference'], 'give either `exact` or `at`, not both');
  const digits = ref.digits !== undefined ? { digits: ref.digits } : {};
  if (ref.exact) {
    const exact = ref.exact;
    keysMatchStates(site, ['reference', 'exact'], exact, states, 'exact expression');
    const scope = makeScope({ time: true, parameters });
    const code = states.map((s) => emitField(site, ['reference', 'exact', s], exact[s]!, scope).js);
    return { kind: 'exact', source: ref.source ?? 'exact solution given in the problem file', exact: compileTimeFunction(code), ...digits };
  }
  if (!ref.at) fail(site, ['reference'], 'needs `exact` (expressions of t) or `at` (a list of times and states)');
  const points = readReferencePoints(site, ref.at, states, t0, tEnd);
  return {
    kind: 'published',
    source: ref.source ?? 'values given in the problem file; the file names no source for them',
    points,
    ...digits,
  };
}

function describe(states: readonly string[], equations: Record<string, Expr>, definitions: Record<string, Expr>): string {
  const defs = Object.entries(definitions).map(([k, v]) => `${k} = ${v}`);
  const eqs = states.map((s) => `${s}' = ${equations[s]}`);
  return [...defs, ...eqs].join('; ');
}
