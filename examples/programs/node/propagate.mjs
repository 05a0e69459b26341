#!/usr/bin/env node
// A user's own orbit propagator, written the way a Node simulation might be: two-body point-mass
// gravity integrated by the Bogacki-Shampine 3(2) pair with its own step control, answering the
// stepgauge-program protocol. Coefficients from P. Bogacki and L. F. Shampine, A 3(2) pair of
// Runge-Kutta formulas, Appl. Math. Lett. 2 (1989) 321-325.
//   node propagate.mjs            one request on stdin, one response on stdout (protocol: once)
//   node propagate.mjs --lines    one request per line, one response per line (protocol: lines)
import { createInterface } from 'node:readline';

function gravity(mu, dim) {
  return (y, dy) => {
    let r2 = 0;
    for (let i = 0; i < dim; i++) r2 += y[i] * y[i];
    const k = -mu / (r2 * Math.sqrt(r2));
    for (let i = 0; i < dim; i++) {
      dy[i] = y[dim + i];
      dy[dim + i] = k * y[i];
    }
  };
}

function solve(request) {
  const started = process.hrtime.bigint();
  const { problem, setting } = request;
  const n = problem.y0.length;
  const f = gravity(problem.parameters.mu ?? 1, n / 2);
  const { rtol } = setting;
  const atol = Array.isArray(setting.atol) ? setting.atol : new Array(n).fill(setting.atol);
  let t = problem.t0;
  const tEnd = problem.tEnd;
  let y = Float64Array.from(problem.y0);
  const k1 = new Float64Array(n), k2 = new Float64Array(n), k3 = new Float64Array(n), k4 = new Float64Array(n);
  const tmp = new Float64Array(n), ynew = new Float64Array(n);
  const times = [t];
  const states = [Array.from(y)];
  const counts = { nfev: 0, njev: 0, nlu: 0, accepted: 0, rejected: 0 };
  f(y, k1);
  counts.nfev++;
  let h = 1e-3 * (tEnd - t);
  while (t < tEnd) {
    if (counts.accepted + counts.rejected > 1e6) return { status: 'step-limit', times, states, counts };
    if (t + h > tEnd) h = tEnd - t;
    for (let i = 0; i < n; i++) tmp[i] = y[i] + 0.5 * h * k1[i];
    f(tmp, k2);
    for (let i = 0; i < n; i++) tmp[i] = y[i] + 0.75 * h * k2[i];
    f(tmp, k3);
    for (let i = 0; i < n; i++) ynew[i] = y[i] + h * ((2 / 9) * k1[i] + (1 / 3) * k2[i] + (4 / 9) * k3[i]);
    f(ynew, k4);
    counts.nfev += 3;
    let err = 0;
    for (let i = 0; i < n; i++) {
      const e = h * ((-5 / 72) * k1[i] + (1 / 12) * k2[i] + (1 / 9) * k3[i] - (1 / 8) * k4[i]);
      const sc = atol[i] + rtol * Math.max(Math.abs(y[i]), Math.abs(ynew[i]));
      err = Math.max(err, Math.abs(e) / sc);
    }
    if (err <= 1) {
      t = t + h === tEnd || tEnd - (t + h) < 1e-12 * Math.abs(tEnd) ? tEnd : t + h;
      y.set(ynew);
      k1.set(k4); // first same as last
      counts.accepted++;
      times.push(t);
      states.push(Array.from(y));
    } else counts.rejected++;
    h *= Math.min(5, Math.max(0.2, 0.9 * Math.pow(1 / Math.max(err, 1e-10), 1 / 3)));
  }
  const seconds = Number(process.hrtime.bigint() - started) / 1e9;
  return { status: 'ok', times, states, counts, seconds };
}

function answer(text) {
  try {
    return JSON.stringify(solve(JSON.parse(text)));
  } catch (e) {
    return JSON.stringify({ status: 'error', message: String(e && e.message ? e.message : e) });
  }
}

if (process.argv.includes('--lines')) {
  const lines = createInterface({ input: process.stdin });
  lines.on('line', (line) => {
    if (line.trim()) process.stdout.write(answer(line) + '\n');
  });
} else {
  let input = '';
  process.stdin.setEncoding('utf8');
  process.stdin.on('data', (c) => (input += c));
  process.stdin.on('end', () => process.stdout.write(answer(input) + '\n'));
}
