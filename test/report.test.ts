import { existsSync, mkdtempSync, readFileSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { main } from '../src/cli/main.js';
import type { ResultsFile } from '../src/results/contract.js';
import { escapeHtml, escapeMarkdown } from '../src/report/escape.js';
import { sig3 } from '../src/report/format.js';
import { CAUTION_TEXT, summarize, writeReport } from '../src/report/index.js';
import { installReport } from '../src/report/install.js';
import { pngSize, syntheticResults } from './report-helpers.js';

const dirs: string[] = [];
function tempDir(): string {
  const d = mkdtempSync(join(tmpdir(), 'stepgauge-report-test-'));
  dirs.push(d);
  return d;
}
afterAll(() => dirs.forEach((d) => rmSync(d, { recursive: true, force: true })));

const XSS = '<script>alert(1)</script>';

/** The fixture with hostile strings in every place data reaches the report. */
function hostile(): ResultsFile {
  const r = syntheticResults();
  const problems = r.problems.map((p, i) => (i === 0 ? { ...p, title: XSS, reference: { ...p.reference, source: `<img src=x onerror=alert(2)>` } } : p));
  const methods = (r.methods as { id: string; name: string }[]).map((m, i) => (i === 1 ? { ...m, name: `RK4 <b>"bold"</b> | pipe` } : m));
  const runs = r.runs.map((run) => (run.message ? { ...run, message: `${run.message} </td><script>x()</script>` } : run));
  return { ...r, problems, methods, runs, environment: { ...r.environment, cpu: '<svg onload=alert(3)>' } };
}

describe('escaping', () => {
  it('escapes HTML and Markdown metacharacters', () => {
    expect(escapeHtml(XSS)).toBe('&lt;script&gt;alert(1)&lt;/script&gt;');
    expect(escapeHtml(`a"b'c&`)).toBe('a&quot;b&#39;c&amp;');
    expect(escapeMarkdown('a|b *c* [d](e)\nf')).toBe('a\\|b \\*c\\* \\[d\\](e) f');
    expect(escapeMarkdown(XSS)).toBe('&lt;script&gt;alert(1)&lt;/script&gt;');
    expect(escapeMarkdown(`it's "quoted" & <b>`)).toBe(`it's "quoted" &amp; &lt;b&gt;`);
  });

  it('never lets data open a tag in report.html or report.md', async () => {
    const out = tempDir();
    await writeReport(hostile(), out);
    const html = readFileSync(join(out, 'report.html'), 'utf8');
    expect(html).toContain('&lt;script&gt;alert(1)&lt;/script&gt;');
    expect(html).not.toContain(XSS);
    expect(html).not.toContain('<img src=x');
    expect(html).not.toContain('<svg');
    expect(html).not.toContain('<b>"bold"</b>');
    expect(html).not.toContain('<script>x()');
    // The only script tag is the report's own sorting script.
    // Ours only: the table sorter, chart.js, the plot data (JSON, '<' escaped) and the chart code.
    expect(html.match(/<script/gi)).toHaveLength(4);
    expect(html).toMatch(/<script>\n\(function \(\) \{/);
    const md = readFileSync(join(out, 'report.md'), 'utf8');
    expect(md).not.toMatch(/<script|<img|<svg|<b>/i);
    expect(md).toContain('&lt;script&gt;alert(1)&lt;/script&gt;');
    // A pipe in a method name must not split a Markdown table cell.
    // Quotes stay as typed in Markdown: without `<` no tag or attribute can open.
    expect(md).toContain('RK4 &lt;b&gt;"bold"&lt;/b&gt; \\| pipe');
  });
});

describe('writeReport', () => {
  const results = syntheticResults();

  it('writes plots, a self-contained report.html and report.md with working links', async () => {
    const out = tempDir();
    const { files } = await writeReport(results, out, { title: 'Synthetic fixture report' });
    const pngs = files.filter((f) => f.startsWith('plots/'));
    // 2 problems x (time, nfev, convergence, proportionality) + 1 drift plot (only the oscillator has an invariant).
    expect(pngs).toHaveLength(9);
    expect(files.slice(-2)).toEqual(['report.html', 'report.md']);
    expect(readdirSync(join(out, 'plots')).sort()).toEqual(pngs.map((f) => f.slice(6)).sort());
    for (const f of pngs) expect(pngSize(readFileSync(join(out, f)))).toEqual({ width: 1200, height: 800 });

    const html = readFileSync(join(out, 'report.html'), 'utf8');
    expect(html).toContain('<title>Synthetic fixture report</title>');
    expect(html.match(/<img src="data:image\/png;base64,/g)).toHaveLength(9);
    // Self-contained: no external fetches of any kind.
    expect(html).not.toMatch(/(src|href)="(https?:)?\/\//);
    expect(html).not.toMatch(/<link\b/);
    // The embedded image is the written PNG.
    const first = readFileSync(join(out, pngs[0]!)).toString('base64');
    expect(html).toContain(`data:image/png;base64,${first}"`);
    expect(html).toContain(escapeHtml(CAUTION_TEXT));
    for (const p of results.problems) expect(html).toContain(p.sha256);
    for (const v of ['v20.0.0', 'synthetic cpu', '0000000']) expect(html).toContain(v);
    expect(html.match(/<table class="sortable">/g)).toHaveLength(2);

    const md = readFileSync(join(out, 'report.md'), 'utf8');
    const links = [...md.matchAll(/!\[[^\]]*\]\(([^)]+)\)/g)].map((m) => m[1]!);
    expect(links.sort()).toEqual(pngs.slice().sort());
    for (const l of links) expect(existsSync(join(out, l))).toBe(true);
    expect(md).toContain(escapeMarkdown(CAUTION_TEXT));
  });

  it('shows table numbers to 3 significant digits', async () => {
    const out = tempDir();
    await writeReport(results, out);
    const html = readFileSync(join(out, 'report.html'), 'utf8');
    const run = results.runs.find((r) => r.method === 'dormand-prince-54' && r.status === 'ok')!;
    // Sort key keeps the full value; the cell shows 3 digits.
    expect(html).toContain(`data-sort="${run.error.final}">${sig3(run.error.final)}</td>`);
    expect(sig3(0.000123456)).toBe('1.23e-4');
    expect(sig3(1.23456e-8)).toBe('1.23e-8');
    expect(sig3(0.0456789)).toBe('0.0457');
    expect(sig3(123456)).toBe('1.23e5');
    expect(sig3(null)).toBe('—');
  });

  it('renders byte-identical files from the same results', async () => {
    const a = tempDir();
    const b = tempDir();
    const fa = (await writeReport(results, a)).files;
    const fb = (await writeReport(syntheticResults(), b)).files;
    expect(fa).toEqual(fb);
    for (const f of fa) expect(Buffer.compare(readFileSync(join(a, f)), readFileSync(join(b, f)))).toBe(0);
  });
});

describe('summary', () => {
  it('counts runs and failures and finds the cheapest method per error level from the data', () => {
    const results = syntheticResults();
    const s = summarize(results);
    expect(s).toMatchObject({ problems: 2, methods: 5, runs: 74, ok: 70 });
    expect(s.failures).toEqual([
      ['diverged', 2],
      ['step-limit', 2],
    ]);
    // Check against a direct scan: for each problem and level, the minimum nfev over ok runs at or below the level.
    for (const b of s.best) {
      for (const l of b.levels) {
        const hit = results.runs.filter((r) => r.problem === b.problem && r.status === 'ok' && r.error.final !== null && r.error.final <= l.level);
        const min = Math.min(...hit.map((r) => r.counts.nfev));
        expect(l.byNfev?.run.counts.nfev ?? Infinity).toBe(min);
      }
    }
    // Each problem's tightest level is the decade just above its smallest ok error (so some run
    // reaches it), its loosest the decade at or below its largest.
    for (const b of s.best) {
      const errors = results.runs.filter((r) => r.problem === b.problem && r.status === 'ok' && r.error.final !== null && r.error.final > 0).map((r) => r.error.final!);
      const levels = b.levels.map((l) => l.level);
      expect(Math.min(...levels)).toBe(Number(`1e${Math.ceil(Math.log10(Math.min(...errors)))}`));
      expect(Math.max(...levels)).toBe(Number(`1e${Math.floor(Math.log10(Math.max(...errors)))}`));
    }
  });
});

describe('stepgauge report', () => {
  it('writes beside results.json without disturbing it and prints the paths', async () => {
    const dir = tempDir();
    const path = join(dir, 'results.json');
    const text = JSON.stringify(syntheticResults());
    writeFileSync(path, text);
    writeFileSync(join(dir, 'results.csv'), 'kept');
    const chunks: string[] = [];
    const write = process.stdout.write.bind(process.stdout);
    process.stdout.write = ((s: string) => (chunks.push(String(s)), true)) as typeof process.stdout.write;
    let code: number;
    try {
      code = await main(['report', path]);
    } finally {
      process.stdout.write = write;
    }
    expect(code).toBe(0);
    expect(readFileSync(path, 'utf8')).toBe(text);
    expect(readFileSync(join(dir, 'results.csv'), 'utf8')).toBe('kept');
    expect(readdirSync(dir).sort()).toEqual(['.stepgauge-output', 'plots', 'report.html', 'report.md', 'results.csv', 'results.json']);
    const printed = chunks.join('').trim().split('\n');
    expect(printed).toHaveLength(11);
    expect(printed).toContain(`wrote ${join(dir, 'report.html')}`);
  });

  it('replaces an earlier report, stale plots included', async () => {
    const dir = tempDir();
    await installReport(syntheticResults(), dir);
    writeFileSync(join(dir, 'plots', 'stale.png'), 'old');
    const only = syntheticResults();
    only.runs = only.runs.filter((r) => r.problem === 'van-der-pol-mu-1');
    only.problems = only.problems.filter((p) => p.id === 'van-der-pol-mu-1');
    await installReport(only, dir);
    expect(readdirSync(join(dir, 'plots')).every((f) => f.startsWith('van-der-pol'))).toBe(true);
    // No temporaries left; the marker says stepgauge wrote the folder (src/results/ownership.ts).
    expect(readdirSync(dir).filter((f) => f.startsWith('.'))).toEqual(['.stepgauge-output']);
  });

  it('rejects a malformed results file with a message naming file and field (exit 2)', async () => {
    const dir = tempDir();
    const errs: string[] = [];
    const write = process.stderr.write.bind(process.stderr);
    process.stderr.write = ((s: string) => (errs.push(String(s)), true)) as typeof process.stderr.write;
    const bad = join(dir, 'bad.json');
    const wrongVersion = join(dir, 'v2.json');
    writeFileSync(bad, JSON.stringify({ ...syntheticResults(), runs: [{ problem: 3 }] }));
    writeFileSync(wrongVersion, JSON.stringify({ ...syntheticResults(), version: 2 }));
    try {
      expect(await main(['report', bad])).toBe(2);
      expect(await main(['report', wrongVersion])).toBe(2);
    } finally {
      process.stderr.write = write;
    }
    expect(errs[0]).toContain(bad);
    expect(errs[0]).toContain('runs[0].problem');
    expect(errs[1]).toContain(wrongVersion);
    expect(errs[1]).toContain('"version"');
    expect(existsSync(join(dir, 'report.html'))).toBe(false);
  });
});
