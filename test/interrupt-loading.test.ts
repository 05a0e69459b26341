// Issue 22: no problem file can make stepgauge ignore Ctrl-C while it loads problems and
// certifies their references (in the main process, before any run starts). Runs the compiled CLI
// (npm test builds first) as a child process so a real signal arrives.
import { spawn } from 'node:child_process';
import { existsSync, mkdtempSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';

const bin = join(import.meta.dirname, '..', 'bin', 'stepgauge.js');
const dir = mkdtempSync(join(tmpdir(), 'sg-int-load-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('Ctrl-C before the runs start', () => {
  it('SIGINT during a certification that would take minutes ends the process at once, writing nothing', async () => {
    // A stiff model declared non-stiff, with a right-hand side of 200 chained definitions: the
    // explicit certifying pair needs millions of steps of an expensive f (minutes).
    const defs = ['  a1: sin(x)'];
    for (let k = 2; k <= 200; k++) defs.push(`  a${k}: sin(a${k - 1}) * 0.5 + a${k - 1} * 0.5`);
    const model = join(dir, 'slow.yaml');
    writeFileSync(model, `id: slow-certify\nstates: [x]\ndefinitions:\n${defs.join('\n')}\nequations:\n  x: -1e6 * (x - cos(t)) + 0 * a200\ninitial: { x: 1 }\nspan: [0, 100]\n`);
    const out = join(dir, 'out');
    const child = spawn(process.execPath, [bin, 'run', '-p', model, '-m', 'rk4', '-s', '10', '--no-timing', '-q', '--jobs', '1', '-o', out], {
      stdio: ['ignore', 'ignore', 'pipe'],
      env: { ...process.env, STEPGAUGE_CACHE: join(dir, 'cache') },
    });
    const ended = new Promise<{ code: number | null; signal: NodeJS.Signals | null }>((resolve) => child.on('exit', (code, signal) => resolve({ code, signal })));
    await new Promise((r) => setTimeout(r, 1500));
    child.kill('SIGINT');
    // Not a timing check: a process that ignored the signal would run for minutes, so it is ended
    // here (and the test fails) rather than left behind.
    const guard = setTimeout(() => child.kill('SIGKILL'), 30_000);
    const { code, signal } = await ended;
    clearTimeout(guard);
    expect(signal, 'the process ignored SIGINT and had to be killed').not.toBe('SIGKILL');
    // Killed by the signal itself (Node's default for SIGINT), or exit 130 if the runs had started.
    expect(signal === 'SIGINT' || code === 130, `code ${code}, signal ${signal}`).toBe(true);
    if (signal === 'SIGINT') expect(existsSync(out) ? readdirSync(out) : []).toEqual([]);
  }, 45_000);
});
