import type { Method } from '../../core/types.js';
import { bdfVariable } from './bdf-variable.js';
import { radauIIA5 } from './radau-iia-5.js';

/** Implicit methods for stiff problems. */
export const implicitMethods: Method[] = [radauIIA5, bdfVariable];
