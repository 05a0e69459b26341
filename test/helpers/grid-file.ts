// A problem file for a k x k grid whose every cell reads itself and its four neighbours (the
// 5-point stencil), for the tests of patterns read from equations. State u<i>_<j> is number
// i k + j; cell (0, 0) starts at 1, the rest at 0, over t in [0, 1].
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';

/**
 * Writes `grid-<k>.yaml` in `dir` and returns its path. `rate(self, neighbours)` gives a cell's
 * equation from its own name and the sum of its neighbours (0 for those past the edge); by
 * default the 5-point Laplacian, neighbours - 4 self.
 */
export function writeGridFile(dir: string, k: number, rate = (self: string, neighbours: string) => `${neighbours} - 4 * ${self}`): string {
  const name = (i: number, j: number) => `u${i}_${j}`;
  const states: string[] = [];
  const eqs: string[] = [];
  for (let i = 0; i < k; i++) {
    for (let j = 0; j < k; j++) {
      states.push(name(i, j));
      const nb = [i > 0 ? name(i - 1, j) : '0', i < k - 1 ? name(i + 1, j) : '0', j > 0 ? name(i, j - 1) : '0', j < k - 1 ? name(i, j + 1) : '0'];
      eqs.push(`  ${name(i, j)}: ${rate(name(i, j), nb.join(' + '))}`);
    }
  }
  const path = join(dir, `grid-${k}.yaml`);
  const initial = states.map((s, n) => `${s}: ${n === 0 ? 1 : 0}`).join(', ');
  writeFileSync(path, `id: grid\ntitle: Grid\nstates: [${states.join(', ')}]\nstiff: true\nequations:\n${eqs.join('\n')}\ninitial: { ${initial} }\nspan: [0, 1]\n`);
  return path;
}
