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
import { runCli } from './helpers/cli.js';

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

  it('charts: hover a point shows its run, a legend click hides a method, a drag zooms and a double-click resets', async () => {
    const page = await browser.newPage({ viewport: { width: 1280, height: 900 } });
    const errors: string[] = [];
    page.on('pageerror', (e) => errors.push(e.message));
    page.on('console', (m) => {
      if (m.type() === 'error') errors.push(m.text());
    });
    await page.route('**/*', (route) => (/^(file|data):/.test(route.request().url()) ? route.continue() : route.abort()));
    await page.goto(pathToFileURL(join(dir, 'report.html')).href, { waitUntil: 'load' });
    const html = readFileSync(join(dir, 'report.html'), 'utf8');
    // One interactive chart per drawn plot, each with its static PNG kept beside it.
    expect(await page.locator('canvas[data-plot]').count()).toBe(html.match(/<img /g)!.length);
    const canvas = page.locator('canvas[data-plot="0"]');
    await canvas.scrollIntoViewIfNeeded();
    // The pixel of dataset 0's first point, from chart.js itself.
    const at = () =>
      canvas.evaluate((c: HTMLCanvasElement) => {
        const chart = (window as unknown as { Chart: { getChart(c: HTMLCanvasElement): any } }).Chart.getChart(c);
        const p = chart.getDatasetMeta(0).data[0].getProps(['x', 'y'], true);
        const r = c.getBoundingClientRect();
        return { x: r.left + p.x, y: r.top + p.y, label: chart.data.datasets[0].label as string, raw: chart.data.datasets[0].data[0] };
      });
    const point = await at();
    await page.mouse.move(point.x, point.y);
    const tip = page.locator('.sg-tooltip');
    await expect.poll(() => tip.isVisible()).toBe(true);
    const text = await tip.innerText();
    // The tooltip names the run behind the point: the same method, setting, evaluations and status
    // as the results file has for it.
    const m = point.raw.m as { method: string; setting: string; nfev: number; status: string };
    const run = results.runs.find((r) => r.method === m.method && r.counts.nfev === m.nfev)!;
    expect(run).toBeDefined();
    expect(text).toContain(m.method);
    expect(text).toContain(`setting: ${m.setting}`);
    expect(text).toContain(`evaluations: ${run.counts.nfev}`);
    expect(text).toContain(`status: ${run.status}`);
    expect(text).toMatch(/error: \S+/);
    expect(text).toMatch(/time: \S+/);

    // Click the first legend entry: that method's series is hidden and its point no longer answers.
    const box = await canvas.evaluate((c: HTMLCanvasElement) => {
      const chart = (window as unknown as { Chart: { getChart(c: HTMLCanvasElement): any } }).Chart.getChart(c);
      const b = chart.legend.legendHitBoxes[0];
      const r = c.getBoundingClientRect();
      return { x: r.left + b.left + b.width / 2, y: r.top + b.top + b.height / 2 };
    });
    await page.mouse.click(box.x, box.y);
    const visible = () => canvas.evaluate((c: HTMLCanvasElement) => (window as unknown as { Chart: { getChart(c: HTMLCanvasElement): any } }).Chart.getChart(c).isDatasetVisible(0));
    // chart.js handles pointer events on the next animation frame, so the click takes effect a frame later.
    await expect.poll(visible, { timeout: 5000 }).toBe(false);
    await page.mouse.move(5, 5);
    await page.mouse.move(point.x, point.y);
    await page.waitForTimeout(200);
    const after = (await tip.isVisible()) ? await tip.innerText() : '';
    expect(after.split('\n')[0]).not.toBe(m.method);

    // Drag a rectangle inside the data area: the x axis narrows; double-click restores it.
    const range = () =>
      canvas.evaluate((c: HTMLCanvasElement) => {
        const chart = (window as unknown as { Chart: { getChart(c: HTMLCanvasElement): any } }).Chart.getChart(c);
        return [chart.scales.x.min, chart.scales.x.max] as [number, number];
      });
    const area = await canvas.evaluate((c: HTMLCanvasElement) => {
      const chart = (window as unknown as { Chart: { getChart(c: HTMLCanvasElement): any } }).Chart.getChart(c);
      const r = c.getBoundingClientRect();
      const a = chart.chartArea;
      return { left: r.left + a.left, top: r.top + a.top, right: r.left + a.right, bottom: r.top + a.bottom };
    });
    const before = await range();
    await page.mouse.move(area.left + (area.right - area.left) * 0.3, area.top + 20);
    await page.mouse.down();
    await page.mouse.move(area.left + (area.right - area.left) * 0.6, area.bottom - 20, { steps: 4 });
    await page.mouse.up();
    const zoomed = await range();
    expect(zoomed[0]).toBeGreaterThan(before[0]);
    expect(zoomed[1]).toBeLessThan(before[1]);
    await page.mouse.dblclick(area.left + 30, area.top + 30);
    expect(await range()).toEqual(before);
    expect(errors).toEqual([]);
    await page.close();
  });

  it('decision.html opens offline with its chart and tooltip', async () => {
    const out = join(dir, 'decision');
    const r = await runCli(['choose', '-p', 'kepler-eccentric', '--target', '1e-6', '-m', 'dormand-prince-54,rk4', '--cost', 'nfev', '--out', out]);
    expect(r.code, r.stderr).toBe(0);
    const page = await browser.newPage({ viewport: { width: 1280, height: 900 } });
    const errors: string[] = [];
    const requests: string[] = [];
    page.on('pageerror', (e) => errors.push(e.message));
    await page.route('**/*', (route) => {
      const url = route.request().url();
      if (/^(file|data):/.test(url)) return route.continue();
      requests.push(url);
      return route.abort();
    });
    await page.goto(pathToFileURL(join(out, 'decision.html')).href, { waitUntil: 'load' });
    expect(await page.locator('#recommendation').innerText()).toMatch(/^Recommended: /);
    const canvas = page.locator('canvas[data-plot="0"]');
    await canvas.scrollIntoViewIfNeeded();
    const point = await canvas.evaluate((c: HTMLCanvasElement) => {
      const chart = (window as unknown as { Chart: { getChart(c: HTMLCanvasElement): any } }).Chart.getChart(c);
      const p = chart.getDatasetMeta(0).data[0].getProps(['x', 'y'], true);
      const rect = c.getBoundingClientRect();
      return { x: rect.left + p.x, y: rect.top + p.y, method: chart.data.datasets[0].data[0].m.method as string };
    });
    await page.mouse.move(point.x, point.y);
    await expect.poll(() => page.locator('.sg-tooltip').isVisible()).toBe(true);
    expect(await page.locator('.sg-tooltip').innerText()).toContain(point.method);
    expect(errors).toEqual([]);
    expect(requests).toEqual([]);
    await page.close();
  });
});
