import type { TableauData, TableauMethod } from '../tableau.js';

/** Forward Euler: L. Euler, Institutionum calculi integralis, vol. 1 (1768). Order 1. */
export const EULER: TableauData = {
  c: [0],
  a: [[]],
  b: [1],
  order: 1,
};

export const euler: TableauMethod = {
  id: 'euler',
  name: 'Euler',
  source: 'L. Euler, Institutionum calculi integralis, vol. 1 (1768)',
  tableau: EULER,
};
