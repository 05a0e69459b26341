// The built-in catalogue: one file per problem, one line here per problem.
import type { Problem } from '../src/core/types.js';

export const catalogue: Problem[] = [];
