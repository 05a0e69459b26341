import type { Method } from '../../core/types.js';

/** Adapters to integrators from other packages. */
export const externalMethods: Method[] = [];
