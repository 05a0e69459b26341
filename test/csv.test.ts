// results.csv text against two independent implementations of RFC 4180 from the registry:
// csv-stringify must write the same bytes, and csv-parse must read back the same fields.
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { stringify } from 'csv-stringify/sync';
import { parse } from 'csv-parse/sync';
import { csvText, neutralised, resultsCsv, CSV_COLUMNS } from '../src/results/csv.js';
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

  it('neutralises text cells a spreadsheet would run as formulas, and leaves number cells alone (issue 22)', async () => {
    // The leading characters and the apostrophe prefix are the OWASP "CSV Injection" page's advice.
    for (const lead of ['=', '+', '-', '@', '\t', '\r']) expect(neutralised(`${lead}SUM(A1:A2)`)).toBe(`'${lead}SUM(A1:A2)`);
    expect(neutralised('diverged at t = 3')).toBe('diverged at t = 3');
    const results = await runSweep({ problem: 'robertson', method: 'rk4', steps: [10], timing: null });
    const run = results.runs[0]!;
    run.message = '-1.5e-3 is what the method said';
    run.error = { final: -1.5e-3, max: -1.5e-3 };
    const rows = parse(resultsCsv(results)) as string[][];
    expect(rows[1]![CSV_COLUMNS.indexOf('message')]).toBe("'-1.5e-3 is what the method said");
    // A number cell keeps its sign and reads back as the same number.
    expect(rows[1]![CSV_COLUMNS.indexOf('error_final')]).toBe('-0.0015');
    expect(Number(rows[1]![CSV_COLUMNS.indexOf('error_max')])).toBe(-1.5e-3);
  });
});
