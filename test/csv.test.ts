// results.csv text against two independent implementations of RFC 4180 from the registry:
// csv-stringify must write the same bytes, and csv-parse must read back the same fields.
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { stringify } from 'csv-stringify/sync';
import { parse } from 'csv-parse/sync';
import { csvText, resultsCsv, CSV_COLUMNS } from '../src/results/csv.js';
import { runSweep } from '../src/sweep/run.js';

// Characters that matter to CSV (separator, quote, both line breaks, space) mixed with plain ones.
const cellText = fc.string({ unit: fc.constantFrom(',', '"', '\n', '\r', ' ', 'a', 'Z', '1', '.', '-', 'é', '×'), maxLength: 12 });
const table = fc.array(fc.array(cellText, { minLength: 3, maxLength: 3 }), { minLength: 1, maxLength: 6 });

describe('results.csv text', () => {
  it('is byte for byte what csv-stringify writes, for any fields', () => {
    fc.assert(fc.property(table, (rows) => csvText(rows) === stringify(rows)), { numRuns: 500 });
  });

  it('reads back to the same fields with csv-parse', () => {
    fc.assert(
      fc.property(table, (rows) => {
        expect(parse(csvText(rows), { relax_column_count: false })).toEqual(rows);
      }),
      { numRuns: 500 },
    );
  });

  it('writes a sweep with failed runs (messages with commas and quotes) as csv-stringify would', async () => {
    // rk4 at 10 equal steps on Robertson fails (its messages are free text); dormand-prince-54 passes.
    const results = await runSweep({ problem: 'robertson,kepler-circular', method: 'rk4,dormand-prince-54', tolerances: [1e-5], steps: [10, 1000], timing: null });
    results.runs[0]!.message = 'a "quoted", two-line\nmessage';
    const text = resultsCsv(results);
    const rows = parse(text) as string[][];
    expect(rows[0]).toEqual([...CSV_COLUMNS]);
    expect(rows).toHaveLength(results.runs.length + 1);
    expect(rows[1]![CSV_COLUMNS.indexOf('message')]).toBe('a "quoted", two-line\nmessage');
    expect(text).toBe(stringify(rows));
  });
});
