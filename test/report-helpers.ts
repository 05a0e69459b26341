// Shared helpers for the report tests: the synthetic structural fixture and PNG header reading.
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import type { ResultsFile } from '../src/results/contract.js';

/** SYNTHETIC fixture (made-up power laws), for structure only; see its `synthetic` field. */
export function syntheticResults(): ResultsFile {
  const path = fileURLToPath(new URL('./fixtures/results-synthetic.json', import.meta.url));
  return JSON.parse(readFileSync(path, 'utf8')) as ResultsFile;
}

/** Width and height from a PNG's IHDR chunk (PNG spec: 8-byte signature, then IHDR at byte 8). */
export function pngSize(png: Uint8Array): { width: number; height: number } {
  const sig = [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a];
  sig.forEach((b, i) => {
    if (png[i] !== b) throw new Error(`not a PNG: byte ${i} is ${png[i]}`);
  });
  const view = new DataView(png.buffer, png.byteOffset, png.byteLength);
  const type = String.fromCharCode(png[12]!, png[13]!, png[14]!, png[15]!);
  if (type !== 'IHDR') throw new Error(`first chunk is ${type}, not IHDR`);
  return { width: view.getUint32(16), height: view.getUint32(20) };
}
