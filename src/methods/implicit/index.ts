import type { Method } from '../../core/types.js';
import { backwardEuler } from './backward-euler.js';
import { bdfVariable } from './bdf-variable.js';
import { implicitMidpoint } from './implicit-midpoint.js';
import { radauIIA5 } from './radau-iia-5.js';
import { rodas4 } from './rodas4.js';
import { ros4LStable } from './ros4-l-stable.js';
import { trBdf2 } from './tr-bdf2.js';

/** Implicit methods for stiff problems. */
export const implicitMethods: Method[] = [backwardEuler, implicitMidpoint, trBdf2, ros4LStable, rodas4, radauIIA5, bdfVariable];
