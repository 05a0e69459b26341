// Opens a generated report.html in headless Chromium: images decode, no console errors, no
// network requests, and clicking a header sorts the table. Data from a real (small) sweep.
import { existsSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { chromium, type Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { ResultsFile } from '../src/results/contract.js';
import { writeReport } from '../src/report/index.js';
import { runSweep } from '../src/sweep/run.js';
import { pngSize } from './report-helpers.js';

const CHROMIUM = '/usr/bin/chromium';
const haveChromium = existsSync(CHROMIUM);

// Skipped on a developer machine without Chromium; in CI its absence is a failure, not a skip.
describe.skipIf(!haveChromium && !process.env.CI)('report.html in a browser', () => {
  let browser: Browser;
  let dir: string;
  let results: ResultsFile;

  beforeAll(async () => {
    if (!haveChromium) {
      throw new Error(`${CHROMIUM} not found: CI must install Debian's chromium (apt-get install -y chromium) for the browser test`);
    }
    dir = mkdtempSync(join(tmpdir(), 'stepgauge-browser-'));
    results = await runSweep({
      problem: 'harmonic-oscillator',
      method: 'rk4,dormand-prince-54,stormer-verlet',
      tolerances: [1e-4, 1e-6, 1e-8],
      steps: [100, 200, 400, 800],
    });
    await writeReport(results, dir, { title: 'Browser check' });
    browser = await chromium.launch({
      executablePath: CHROMIUM,
      args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
    });
  });

  afterAll(async () => {
    await browser?.close();
    if (dir) rmSync(dir, { recursive: true, force: true });
  });

  it('loads every image, stays offline, logs no errors and sorts on header click', async () => {
    expect(results.runs.length).toBe(3 + 2 * 4); // dp54 x 3 tolerances; rk4 and stormer-verlet x 4 step counts
    const page = await browser.newPage({ viewport: { width: 1280, height: 900 } });
    const errors: string[] = [];
    const requests: string[] = [];
    page.on('console', (m) => {
      if (m.type() === 'error') errors.push(m.text());
    });
    page.on('pageerror', (e) => errors.push(e.message));
    await page.route('**/*', (route) => {
      const url = route.request().url();
      if (url.startsWith('file:') || url.startsWith('data:')) return route.continue();
      requests.push(url);
      return route.abort();
    });
    await page.goto(pathToFileURL(join(dir, 'report.html')).href, { waitUntil: 'load' });

    const images = await page.$$eval('img', (imgs) => imgs.map((i) => ({ complete: i.complete, w: i.naturalWidth, h: i.naturalHeight })));
    const html = readFileSync(join(dir, 'report.html'), 'utf8');
    expect(images.length).toBe(html.match(/<img /g)!.length);
    expect(images.length).toBeGreaterThanOrEqual(3);
    for (const im of images) expect(im).toEqual({ complete: true, w: 1200, h: 800 });

    const table = page.locator('table.sortable').first();
    const headers = await table.locator('thead th').allTextContents();
    const col = headers.indexOf('error.final');
    expect(col).toBeGreaterThan(0);
    const column = () =>
      table.evaluate(
        (t: HTMLTableElement, c: number) => Array.from(t.tBodies[0]!.rows).map((r) => r.cells[c]!.getAttribute('data-sort') ?? ''),
        col,
      );
    const before = await column();
    await table.locator('thead th').nth(col).click();
    const asc = await column();
    expect(asc).not.toEqual(before);
    const filled = asc.filter((v) => v !== '').map(Number);
    expect(filled).toEqual(filled.slice().sort((a, b) => a - b));
    expect(asc.slice(filled.length).every((v) => v === '')).toBe(true);
    expect(await table.locator('thead th').nth(col).getAttribute('aria-sort')).toBe('ascending');
    await table.locator('thead th').nth(col).click();
    const desc = (await column()).filter((v) => v !== '').map(Number);
    expect(desc).toEqual(filled.slice().reverse());

    const shot = join(dir, 'report-screenshot.png');
    await page.screenshot({ path: shot, fullPage: true });
    expect(pngSize(readFileSync(shot)).width).toBe(1280);
    expect(errors).toEqual([]);
    expect(requests).toEqual([]);
    await page.close();
  });
});
