// Hostile expressions in a colleague's problem file must be refused at load time, naming the
// file, the field and the construct; none may run code or read files.
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { expect, test } from 'vitest';
import { loadProblemFile } from '../src/problems/load-file.js';

const dir = mkdtempSync(join(tmpdir(), 'sg-user-hostile-'));

function fileWith(expression: string, k: number): string {
  const path = join(dir, `hostile-${k}.json`);
  const spec = {
    id: 'hostile', title: 'Hostile', states: ['x'],
    equations: { x: expression }, initial: { x: 1 }, span: [0, 1],
  };
  writeFileSync(path, JSON.stringify(spec, null, 2));
  return path;
}

const HOSTILE: [string, RegExp][] = [
  ['import("fs")', /function 'import' is not allowed/],
  ['evaluate("1+1")', /function 'evaluate' is not allowed/],
  ['parse("x")', /function 'parse' is not allowed/],
  ['compile("x")', /function 'compile' is not allowed/],
  ['createUnit("foo")', /function 'createUnit' is not allowed/],
  ['sin.constructor("return process")(1)', /calling `sin\.constructor` is not allowed/],
  ['cos["constructor"]("return 1")(x)', /calling `cos\["constructor"\]` is not allowed/],
  ['x["constructor"]', /property access or indexing/],
  ['f(y) = y + 1', /function definition/],
  ['x = 3', /assignment/],
  ['[1, 2]', /array or matrix/],
  ['{a: 1}', /object/],
  ['"hello"', /text constant/],
  ['x; x', /several statements/],
  ['1:3', /range/],
  ['x!', /operator '!' \(factorial\)/],
  ['x mod 2', /operator 'mod'/],
  ['process', /unknown symbol 'process'/],
  ['globalThis', /unknown symbol 'globalThis'/],
  ['(sin)(x)', /unknown symbol 'sin'/],
  ['true', /boolean constant/],
  ['5 cm', /unknown symbol 'cm'/],
  ['sin(x, 2)', /function 'sin' takes 1 argument/],
];

test.each(HOSTILE.map(([e, r], k) => [e, r, k] as const))('refuses %s', async (expression, pattern, k) => {
  const path = fileWith(expression, k);
  const err = await loadProblemFile(path).then(
    () => undefined,
    (e: Error) => e,
  );
  expect(err?.name).toBe('InputError');
  expect(err!.message).toContain(path);
  expect(err!.message).toContain('equations.x:');
  expect(err!.message).toMatch(pattern);
});

test('hostile text in a definition or invariant is refused the same way', async () => {
  const path = join(dir, 'hostile-def.yaml');
  writeFileSync(path, 'id: h\ntitle: H\nstates: [x]\ndefinitions:\n  a: import("child_process")\nequations: { x: a }\ninitial: { x: 0 }\nspan: [0, 1]\n');
  await expect(loadProblemFile(path)).rejects.toThrow(/hostile-def\.yaml:5:6: definitions\.a: function 'import' is not allowed/);
  const inv = join(dir, 'hostile-inv.yaml');
  writeFileSync(inv, 'id: h\ntitle: H\nstates: [x]\nequations: { x: 1 }\ninitial: { x: 0 }\nspan: [0, 1]\ninvariants: { leak: "x.constructor" }\n');
  await expect(loadProblemFile(inv)).rejects.toThrow(/invariants\.leak: property access or indexing/);
});

test('state names that look like JavaScript never reach generated code', async () => {
  // A state called `toString` (a name every object inherits) is only a map key; the generated
  // function refers to it as s0. f(t, [2]) = 3 * 2 = 6 (hand computed).
  const path = join(dir, 'names.yaml');
  writeFileSync(path, 'id: h\ntitle: H\nstates: [toString]\nequations: { toString: 3 * toString }\ninitial: { toString: 2 }\nspan: [0, 1]\n');
  const p = await loadProblemFile(path);
  const dy = new Float64Array(1);
  p.f(0, Float64Array.of(2), dy);
  expect(dy[0]).toBe(6);
  expect(p.f.toString()).not.toContain('toString');
});

test('prototype names (constructor, __proto__, prototype) are refused as names, naming the field (issue 22)', async () => {
  const path = join(dir, 'proto-state.yaml');
  writeFileSync(path, 'id: h\ntitle: H\nstates: [constructor]\nequations: { x: 1 }\ninitial: { x: 2 }\nspan: [0, 1]\n');
  await expect(loadProblemFile(path)).rejects.toThrow(`${path}:3:10: states[0]: state name 'constructor' cannot be used (it is special to JavaScript objects)`);
});
