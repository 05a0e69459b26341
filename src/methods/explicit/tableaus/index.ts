// The registry of explicit Runge-Kutta methods: one line per tableau file, each file holding its
// method's coefficients and identity (TableauMethod). Methods are listed fixed-step first, then by
// order, then by id (explicit/index.ts), so a line's place here changes nothing.
export { euler } from './euler.js';
export { midpoint } from './midpoint.js';
export { rk4 } from './rk4.js';
export { rk438 } from './rk4-38.js';
export { bogackiShampine32 } from './bogacki-shampine-32.js';
export { fehlberg45 } from './fehlberg-45.js';
export { cashKarp45 } from './cash-karp-45.js';
export { dormandPrince54 } from './dormand-prince-54.js';
export { tsitouras54 } from './tsitouras-54.js';
export { verner65 } from './verner-65.js';
export { verner76 } from './verner-76.js';
export { dormandPrince853 } from './dormand-prince-853.js';
export { verner87 } from './verner-87.js';
export { verner98 } from './verner-98.js';
export { heunEuler21 } from './heun-euler-21.js';
