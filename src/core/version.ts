import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { dirname, join } from 'node:path';

let cached: string | undefined;

/** The package version, read from package.json next to the build (src or dist layout). */
export function packageVersion(): string {
  if (cached) return cached;
  let dir = dirname(fileURLToPath(import.meta.url));
  for (let i = 0; i < 5; i++) {
    try {
      const pkg = JSON.parse(readFileSync(join(dir, 'package.json'), 'utf8')) as { name?: string; version?: string };
      if (pkg.name === 'stepgauge' && pkg.version) return (cached = pkg.version);
    } catch {
      /* keep climbing */
    }
    dir = dirname(dir);
  }
  return (cached = '0.0.0');
}
