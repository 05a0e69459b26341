#!/usr/bin/env node
// Thin launcher: the CLI is compiled to dist/ by `npm run build` (run automatically by `npm ci`).
import { existsSync } from 'node:fs';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { dirname, join } from 'node:path';

const here = dirname(fileURLToPath(import.meta.url));
const entry = join(here, '..', 'dist', 'src', 'cli', 'main.js');
if (!existsSync(entry)) {
  process.stderr.write('stepgauge: not built yet; run `npm run build` (or `npm ci`) in the package folder first\n');
  process.exit(2);
}
const { main, installProcessHooks } = await import(pathToFileURL(entry).href);
installProcessHooks();
process.exitCode = await main(process.argv.slice(2));
