// The run summary's "best error" column on SYNTHETIC results (test/fixtures/gate/synthetic.ts):
// it reads the unresolved marks, so an error the reference cannot confirm is never shown as a
// method's best beside a confirmed one, and is marked "(at ref.)" when it is all there is.
import { describe, expect, it } from 'vitest';
import { summaryText } from '../src/cli/summary.js';
import { syntheticResults, syntheticRun } from './fixtures/gate/synthetic.js';

const row = (text: string, method: string) => text.split('\n').find((l) => l.startsWith(`${method} `))!;

describe('summaryText', () => {
  it('shows the smallest confirmed final error, not a smaller one at the reference', () => {
    const text = summaryText(
      syntheticResults([
        syntheticRun({ method: 'm-a', setting: { rtol: 1e-4, atol: 1e-4 }, error: { final: 3e-5, max: 4e-5 } }),
        syntheticRun({ method: 'm-a', setting: { rtol: 1e-6, atol: 1e-6 }, error: { final: 2e-7, max: 3e-7 } }),
        // Within reach of the reference's resolution, marked only in `unresolved` (no older flag).
        syntheticRun({ method: 'm-a', setting: { rtol: 1e-10, atol: 1e-10 }, error: { final: 1e-11, max: 1e-11 }, unresolved: ['final', 'max'] }),
        syntheticRun({ method: 'm-b', setting: { rtol: 1e-10, atol: 1e-10 }, error: { final: 4e-11, max: 4e-11 }, unresolved: ['final'], errorBelowReference: true }),
        syntheticRun({ method: 'm-b', setting: { rtol: 1e-12, atol: 1e-12 }, error: { final: 5e-12, max: 5e-12 }, unresolved: ['final'] }),
      ]),
    );
    expect(row(text, 'm-a')).toMatch(/^m-a\s+3\s+3\s+2\.00e-7\s+rtol 1\.00e-6\s/);
    expect(row(text, 'm-a')).not.toContain('(at ref.)');
    // No confirmed error at all: the smallest measured one, marked.
    expect(row(text, 'm-b')).toMatch(/^m-b\s+2\s+2\s+5\.00e-12 \(at ref\.\)\s+rtol 1\.00e-12\s/);
  });
});
