import type { Method } from '../../core/types.js';

/** Implicit methods for stiff problems. */
export const implicitMethods: Method[] = [];
