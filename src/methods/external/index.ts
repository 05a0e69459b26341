import type { Method } from '../../core/types.js';
import { odexMethod } from './odex.js';

/** Adapters to integrators from other packages. */
export const externalMethods: Method[] = [odexMethod];
