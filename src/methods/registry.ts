// Every built-in method, in listing order. A new method is one line in its family's index.
import type { Method } from '../core/types.js';
import { explicitMethods } from './explicit/index.js';
import { implicitMethods } from './implicit/index.js';
import { externalMethods } from './external/index.js';
import { discreteMethods } from './discrete/hold.js';

export function builtinMethods(): Method[] {
  return [...explicitMethods, ...implicitMethods, ...discreteMethods, ...externalMethods];
}

export function findMethod(id: string): Method | undefined {
  return builtinMethods().find((m) => m.id === id);
}
