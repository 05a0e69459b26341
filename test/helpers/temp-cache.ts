// A temporary certificate cache for one test file (STEPGAUGE_CACHE), removed and restored after.
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll } from 'vitest';

export function useTempCache(prefix: string): void {
  let cache = '';
  const before = process.env.STEPGAUGE_CACHE;
  beforeAll(() => {
    cache = mkdtempSync(join(tmpdir(), prefix));
    process.env.STEPGAUGE_CACHE = cache;
  });
  afterAll(() => {
    if (before === undefined) delete process.env.STEPGAUGE_CACHE;
    else process.env.STEPGAUGE_CACHE = before;
    rmSync(cache, { recursive: true, force: true });
  });
}
