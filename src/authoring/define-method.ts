// defineMethod: the way a user's module describes an integrator. It checks what the method says
// about itself; whether `solve` is right is for the sweep to measure.
import type { Family, Method } from '../core/types.js';
import { InputError } from '../core/errors.js';
import { brand, METHOD_BRAND } from './brand.js';

const FAMILIES: readonly Family[] = ['fixed-step', 'embedded-explicit', 'symplectic', 'implicit', 'extrapolation', 'external'];
const KEBAB = /^[a-z0-9]+(-[a-z0-9]+)*$/;

export type MethodSpec = Method;

export function defineMethod(spec: MethodSpec): Method {
  if (!spec || typeof spec !== 'object') throw new InputError('defineMethod needs an object');
  const where = `defineMethod(${typeof spec.id === 'string' ? spec.id : '?'})`;
  const bad = (message: string): never => {
    throw new InputError(message, where);
  };
  if (typeof spec.id !== 'string' || !KEBAB.test(spec.id)) bad(`id must be kebab-case, got ${JSON.stringify(spec.id)}`);
  if (typeof spec.name !== 'string' || !spec.name.trim()) bad('name must be a non-empty text (the published method)');
  if (!FAMILIES.includes(spec.family)) bad(`family must be one of ${FAMILIES.join(', ')}, got ${JSON.stringify(spec.family)}`);
  if (!Number.isInteger(spec.order) || spec.order < 1) bad(`order must be a positive integer, got ${JSON.stringify(spec.order)}`);
  if (typeof spec.source !== 'string' || !spec.source.trim()) bad('source must name the paper or book the method comes from');
  if (typeof spec.adaptive !== 'boolean') bad('adaptive must be true or false');
  if (typeof spec.stiff !== 'boolean') bad('stiff must be true or false');
  if (spec.needsSeparable !== undefined && typeof spec.needsSeparable !== 'boolean') bad('needsSeparable must be true or false');
  if (spec.needsSecondOrder !== undefined && typeof spec.needsSecondOrder !== 'boolean') bad('needsSecondOrder must be true or false');
  if (spec.embeddedOrder !== undefined && (!Number.isInteger(spec.embeddedOrder) || spec.embeddedOrder < 1)) bad('embeddedOrder must be a positive integer');
  if (spec.stepGrowth !== undefined && !(Number.isFinite(spec.stepGrowth) && spec.stepGrowth > 0 && spec.stepGrowth <= 1)) {
    bad(`stepGrowth must be a number in (0, 1] (steps grow like rtol^-stepGrowth), got ${JSON.stringify(spec.stepGrowth)}`);
  }
  if (spec.adaptive && spec.family === 'fixed-step') bad("a 'fixed-step' method cannot be adaptive");
  if (typeof spec.solve !== 'function') bad('solve must be a function (problem, setting, options) => result');
  const solve = spec.solve;
  const method: Method = {
    id: spec.id,
    name: spec.name,
    family: spec.family,
    order: spec.order,
    source: spec.source,
    adaptive: spec.adaptive,
    stiff: spec.stiff,
    ...(spec.needsSeparable !== undefined ? { needsSeparable: spec.needsSeparable } : {}),
    ...(spec.needsSecondOrder !== undefined ? { needsSecondOrder: spec.needsSecondOrder } : {}),
    ...(spec.embeddedOrder !== undefined ? { embeddedOrder: spec.embeddedOrder } : {}),
    ...(spec.stepGrowth !== undefined ? { stepGrowth: spec.stepGrowth } : {}),
    ...(spec.notes !== undefined ? { notes: spec.notes } : {}),
    solve: (problem, setting, options) => solve.call(spec, problem, setting, options),
  };
  return brand(method, METHOD_BRAND);
}
