// Allocation check: heap growth per step for every built-in method, each in a fresh process (see
// heap-child.ts): the slope between a short and a long solve, so buffers allocated once per solve
// cancel out. A number near zero means no allocation in the step loop; 16 or more per step means
// a heap number or an object is made every step.
import { execFileSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { dirname, join } from 'node:path';
import { builtinMethods } from '../src/methods/registry.js';

const here = dirname(fileURLToPath(import.meta.url));

export interface HeapRow {
  method: string;
  problem: string;
  steps: number;
  heapGrowthBytes: number;
  bytesPerStep: number;
}

export function runHeapBench(): HeapRow[] {
  const rows: HeapRow[] = [];
  for (const m of builtinMethods()) {
    if (m.family === 'external') continue; // odex allocates by its own design (arrays in and out)
    const problem = m.stiff ? 'van-der-pol' : 'kepler-eccentric';
    // (each child runs the problem's span 100 times over, see heap-child.ts)
    const [short, long] = m.adaptive
      ? [{ rtol: 1e-6, atol: 1e-6 }, { rtol: 1e-10, atol: 1e-10 }]
      : [{ steps: 200_000 }, { steps: 1_000_000 }];
    const out = execFileSync(
      process.execPath,
      ['--expose-gc', '--max-semi-space-size=512', join(here, 'heap-child.js'), m.id, problem, JSON.stringify(short), JSON.stringify(long)],
      { encoding: 'utf8' },
    );
    rows.push(JSON.parse(out.trim().split('\n').at(-1)!) as HeapRow);
  }
  return rows;
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  console.table(runHeapBench().map((r) => ({ ...r, bytesPerStep: Number(r.bytesPerStep.toFixed(2)) })));
}
