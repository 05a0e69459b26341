// The built-in catalogue: one file per problem, one line here per problem. Each is held in the
// one object layout every solved problem has (src/problems/uniform.ts).
import type { Problem } from '../src/core/types.js';
import { uniformProblem } from '../src/problems/uniform.js';
import { harmonicOscillator } from './harmonic-oscillator.js';
import { keplerCircular } from './kepler-circular.js';
import { keplerEccentric } from './kepler-eccentric.js';
import { vanDerPol } from './van-der-pol.js';
import { vanDerPolStiff } from './van-der-pol-stiff.js';
import { robertson } from './robertson.js';
import { linearOscillatorChain } from './linear-oscillator-chain.js';
import { eclipseCircularOrbit } from './eclipse-circular-orbit.js';
import { leoJ2 } from './leo-j2.js';
import { arenstorfOrbit } from './arenstorf-orbit.js';
import { tetheredPair } from './tethered-pair.js';
import { decayingOrbitDrag } from './decaying-orbit-drag.js';
import { brusselator1d } from './brusselator-1d.js';
import { heat2d } from './heat-2d.js';

export const catalogue: Problem[] = [
  harmonicOscillator,
  keplerCircular,
  keplerEccentric,
  vanDerPol,
  vanDerPolStiff,
  robertson,
  linearOscillatorChain,
  eclipseCircularOrbit,
  leoJ2,
  arenstorfOrbit,
  tetheredPair,
  decayingOrbitDrag,
  brusselator1d,
  heat2d,
].map(uniformProblem);

export function findProblem(id: string): Problem | undefined {
  return catalogue.find((p) => p.id === id);
}
