// Every bad-input case of problem files: the message must name the file, the field and, where the
// file gives one, the line and column.
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, test } from 'vitest';
import { loadProblemFile } from '../src/problems/load-file.js';

const dir = mkdtempSync(join(tmpdir(), 'sg-user-errors-'));
let counter = 0;
function write(name: string, text: string): string {
  const path = join(dir, `${counter++}-${name}`);
  writeFileSync(path, text);
  return path;
}

const GOOD = `id: spring
title: Spring
states: [x, v]
parameters: { k: 4 }
equations:
  x: v
  v: -k * x
initial: { x: 1, v: 0 }
span: [0, 10]
`;

async function message(path: string): Promise<string> {
  try {
    await loadProblemFile(path);
  } catch (e) {
    expect((e as Error).name).toBe('InputError');
    return (e as Error).message;
  }
  throw new Error('expected an InputError');
}

describe('syntax errors carry line and column', () => {
  test('YAML: unclosed flow sequence', async () => {
    const path = write('bad.yaml', 'id: a\ntitle: b\nstates: [x, v\nequations: {}\n');
    const m = await message(path);
    expect(m).toContain(path);
    expect(m).toMatch(/bad\.yaml:\d+:\d+: YAML syntax error/);
  });
  test('YAML: duplicate key reports the line of the second key', async () => {
    const path = write('dup.yaml', GOOD.replace('  v: -k * x\n', '  v: -k * x\n  v: 0\n'));
    expect(await message(path)).toMatch(/dup\.yaml:8:3: YAML syntax error/);
  });
  test('JSON: missing comma at line 3, column 3', async () => {
    // Line 3 starts with two spaces then "b": the parser stops at the quote (column 3).
    const path = write('bad.json', '{\n  "id": "a"\n  "b": 1\n}\n');
    expect(await message(path)).toMatch(/bad\.json:3:3: JSON syntax error/);
  });
});

describe('meaning errors name the field and point at it', () => {
  test('unknown symbol in an equation', async () => {
    const path = write('unknown.yaml', GOOD.replace('v: -k * x', 'v: -kk * x'));
    const m = await message(path);
    expect(m).toMatch(/unknown\.yaml:7:6: equations\.v: unknown symbol 'kk'/);
    expect(m).toContain('known here: t, x, v, k');
  });
  test('missing equation', async () => {
    const m = await message(write('missing-eq.yaml', GOOD.replace('  v: -k * x\n', '')));
    expect(m).toMatch(/equations: state 'v' has no equation/);
  });
  test('equation for a name that is not a state', async () => {
    const m = await message(write('extra-eq.yaml', GOOD.replace('  v: -k * x\n', '  v: -k * x\n  w: 1\n')));
    expect(m).toMatch(/equations\.w: 'w' is not a state/);
  });
  test('state without an initial value', async () => {
    const m = await message(write('no-init.yaml', GOOD.replace('initial: { x: 1, v: 0 }', 'initial: { x: 1 }')));
    expect(m).toMatch(/no-init\.yaml:8:\d+: initial: state 'v' has no initial value/);
  });
  test('cycle in definitions names the definitions on it', async () => {
    const text = GOOD.replace('equations:', 'definitions:\n  a: b + 1\n  b: c * 2\n  c: a - x\nequations:');
    const m = await message(write('cycle.yaml', text));
    expect(m).toContain('definitions form a cycle: a -> b -> c -> a');
  });
  test('forward reference in definitions', async () => {
    const text = GOOD.replace('equations:', 'definitions:\n  a: b + 1\n  b: x * 2\nequations:');
    const m = await message(write('forward.yaml', text));
    expect(m).toMatch(/definitions\.a: definition 'a' uses 'b', which is defined after it/);
  });
  test('empty span', async () => {
    expect(await message(write('empty.yaml', GOOD.replace('span: [0, 10]', 'span: [3, 3]')))).toMatch(/span: span \[3, 3\] is empty/);
  });
  test('reversed span', async () => {
    expect(await message(write('reversed.yaml', GOOD.replace('span: [0, 10]', 'span: [10, 0]')))).toMatch(/span: span \[10, 0\] is reversed/);
  });
  test('shape error from the schema names the field', async () => {
    const m = await message(write('shape.yaml', GOOD.replace('id: spring', 'id: Spring_Model')));
    expect(m).toMatch(/shape\.yaml:1:5: id: must be kebab-case/);
  });
  test('unknown top-level field is rejected', async () => {
    expect(await message(write('typo.yaml', `${GOOD}stif: true\n`))).toMatch(/Unrecognized key.*stif/);
  });
  test('reserved name', async () => {
    expect(await message(write('reserved.yaml', GOOD.replace('{ k: 4 }', '{ sin: 4 }')))).toMatch(/parameters\.sin: parameter name 'sin' is reserved/);
  });
  test('parameter using a later parameter', async () => {
    expect(await message(write('param.yaml', GOOD.replace('{ k: 4 }', '{ k: 2 * m, m: 2 }')))).toMatch(/parameters\.k: parameter 'k' uses 'm', which is defined after it/);
  });
  test('declared separable split that does not hold names the breaking equation', async () => {
    const text = GOOD.replace('v: -k * x', 'v: -k * x - 0.1 * v') + 'separable: { positions: [x], velocities: [v] }\n';
    expect(await message(write('split.yaml', text))).toMatch(/separable: the split does not hold: the derivative of velocity v depends on v, which is not a position/);
  });
  test('relative error without a floor', async () => {
    expect(await message(write('floor.yaml', `${GOOD}error: { scale: relative }\n`))).toMatch(/error: scale: relative needs a floor/);
  });
  test('outputs measure without outputs', async () => {
    expect(await message(write('outm.yaml', `${GOOD}error: { measure: outputs }\n`))).toMatch(/error\.measure: measure: outputs needs an `outputs` section/);
  });
  test('reference point outside the span', async () => {
    expect(await message(write('ref.yaml', `${GOOD}reference:\n  at: [ { t: 11, x: 0, v: 0 } ]\n`))).toMatch(/reference\.at\[0\]\.t: time 11 is outside the span/);
  });
});
