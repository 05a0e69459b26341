// The registry of symplectic compositions of Stormer-Verlet: one line per method file, each file
// holding its method's identity and substep weights (CompositionMethod). Methods are listed by
// order, then by id (explicit/index.ts), so a line's place here changes nothing.
export { stormerVerlet } from './stormer-verlet.js';
export { yoshida4 } from './yoshida-4.js';
