// Certifies the reference of brusselator-1d (src/measure/certify.ts: radau-iia-5 and bdf-variable
// at rtol = atol = 1e-12, agreement in digits) and writes it to brusselator-1d-reference.ts.
// Not a benchmark: it lives in bench/ because the catalogue's layer may not import the measuring
// layer. By hand, after changing the problem: npm run build && node dist/bench/certify-brusselator.js
import { writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { certify } from '../src/measure/certify.js';
import { brusselator1d } from '../problems/brusselator-1d.js';

const started = performance.now();
const cert = certify({ ...brusselator1d, reference: { kind: 'certified' }, checkTimes: [9] });
const y = cert.points.at(-1)!.y;
const text = y.map((v) => String(v)).join(',');
const how = cert.runs.map((r) => `${r.method} at rtol ${r.rtol}${r.maxStep !== undefined ? ` (steps at most ${r.maxStep})` : ''}`).join(' and ');
const out = [
  '// Written by bench/certify-brusselator.ts; do not edit by hand.',
  `// ${how} agree to ${cert.digits} digits (src/measure/certify.ts), ${new Date().toISOString().slice(0, 10)}.`,
  'export const BRUSSELATOR_REFERENCE = {',
  `  digits: ${cert.digits},`,
  `  source: 'certified: ${how} agree to ${cert.digits} digits at t = 9 and 10',`,
  `  y: [${text}],`,
  '};',
  '',
].join('\n');
const here = dirname(fileURLToPath(import.meta.url));
const src = join(here, here.endsWith(join('dist', 'bench')) ? '../..' : '..', 'problems');
writeFileSync(join(src, 'brusselator-1d-reference.ts'), out);
console.log(`certified ${cert.digits} digits in ${((performance.now() - started) / 1000).toFixed(1)} s`);
