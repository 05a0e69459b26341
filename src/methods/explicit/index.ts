import type { Method } from '../../core/types.js';

/** Fixed-step, embedded explicit and symplectic methods. */
export const explicitMethods: Method[] = [];
