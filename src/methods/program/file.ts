// Program files (YAML): how to start a user's own simulation and which setting it takes. They are
// code, trusted like method modules, so they come only from the command line (`--method`).
import { accessSync, constants, existsSync, readFileSync, statSync } from 'node:fs';
import { delimiter, dirname, isAbsolute, join, resolve } from 'node:path';
import { parse } from 'yaml';
import { z } from 'zod';
import { InputError } from '../../core/errors.js';
import { sha256 } from '../../core/hash.js';

const KEBAB = /^[a-z0-9]+(-[a-z0-9]+)*$/;
const PLACEHOLDERS = { steps: ['steps', 'h'], tolerance: ['rtol', 'atol'] } as const;

const programFileSchema = z
  .object({
    id: z.string().regex(KEBAB, 'must be kebab-case (lower-case words joined by -)'),
    name: z.string().trim().min(1, 'must be a non-empty text'),
    program: z.array(z.string().min(1, 'arguments must be non-empty')).min(1, 'must name the program to start'),
    settings: z.enum(['steps', 'tolerance']),
    protocol: z.enum(['once', 'lines']).default('once'),
    order: z.number().int().positive().optional(),
    timeout: z.number().positive().optional(),
    stiff: z.boolean().optional(),
    source: z.string().trim().min(1).optional(),
  })
  .strict();

export interface ProgramSpec {
  id: string;
  name: string;
  /** argv with placeholders; argv[0] resolved to a path when it was given as one. */
  argv: string[];
  /** The program file's folder: the program's working directory. */
  cwd: string;
  settings: 'steps' | 'tolerance';
  protocol: 'once' | 'lines';
  order?: number;
  timeoutSeconds?: number;
  stiff: boolean;
  source?: string;
  /** The path as given, and a hash of the file's text (the audit trail). */
  file: string;
  sha256: string;
}

function describeIssue(issue: z.core.$ZodIssue): string {
  const field = issue.path.length ? issue.path.join('.') : '(top level)';
  if (issue.code === 'unrecognized_keys') return `unknown field ${issue.keys.map((k) => `'${k}'`).join(', ')}; expected id, name, program, settings, protocol, order, timeout, stiff, source`;
  if (issue.path[0] === 'program' && issue.path.length === 1 && issue.code === 'invalid_type') {
    return 'program: expected a list of arguments such as [./build/prop, --steps, "{steps}"] (never a shell command line)';
  }
  return `${field}: ${issue.message}`;
}

function isExecutable(path: string): boolean {
  try {
    accessSync(path, constants.X_OK);
    return statSync(path).isFile();
  } catch {
    return false;
  }
}

/** Where argv[0] will be started from, or a one-line reason it cannot be. */
function locateProgram(command: string, cwd: string): { path: string } | { why: string } {
  if (command.includes('/')) {
    const path = isAbsolute(command) ? command : resolve(cwd, command);
    if (!existsSync(path)) return { why: `'${command}' does not exist (looked for ${path})` };
    if (!isExecutable(path)) return { why: `'${command}' is not an executable file (${path})` };
    return { path };
  }
  for (const dir of (process.env.PATH ?? '').split(delimiter)) {
    if (dir && isExecutable(join(dir, command))) return { path: command };
  }
  return { why: `'${command}' is not on the PATH` };
}

/** Checks every argument's placeholders: known, and fitting the settings the program takes. */
function checkPlaceholders(argv: readonly string[], settings: 'steps' | 'tolerance', where: string): void {
  argv.forEach((arg, k) => {
    for (const m of arg.matchAll(/\{([^{}]*)\}/g)) {
      const name = m[1]!;
      const allowed: readonly string[] = PLACEHOLDERS[settings];
      if (allowed.includes(name)) continue;
      const other = settings === 'steps' ? 'tolerance' : 'steps';
      const why = (PLACEHOLDERS[other] as readonly string[]).includes(name)
        ? `{${name}} is given only to programs with settings: ${other}`
        : `unknown placeholder {${name}}; expected ${allowed.map((a) => `{${a}}`).join(' or ')}`;
      throw new InputError(why, `${where}: program[${k}]`);
    }
  });
}

export function loadProgramFile(path: string): ProgramSpec {
  const where = `--method ${path}`;
  let text: string;
  try {
    text = readFileSync(path, 'utf8');
  } catch (e) {
    throw new InputError(`cannot read the program file (${(e as NodeJS.ErrnoException).code ?? (e as Error).message})`, where);
  }
  let data: unknown;
  try {
    data = parse(text);
  } catch (e) {
    throw new InputError(`not valid YAML: ${(e as Error).message.split('\n')[0]}`, where);
  }
  if (typeof data === 'string' && /\s/.test(data)) throw new InputError('a program file is a mapping (id, name, program, settings, ...), not a command line', where);
  const parsed = programFileSchema.safeParse(data);
  if (!parsed.success) throw new InputError(describeIssue(parsed.error.issues[0]!), where);
  const spec = parsed.data;
  checkPlaceholders(spec.program, spec.settings, where);
  const cwd = dirname(resolve(path));
  const located = locateProgram(spec.program[0]!, cwd);
  if ('why' in located) throw new InputError(`cannot start the program: ${located.why}`, `${where}: program[0]`);
  return {
    id: spec.id,
    name: spec.name,
    argv: [located.path, ...spec.program.slice(1)],
    cwd,
    settings: spec.settings,
    protocol: spec.protocol,
    ...(spec.order !== undefined ? { order: spec.order } : {}),
    ...(spec.timeout !== undefined ? { timeoutSeconds: spec.timeout } : {}),
    stiff: spec.stiff ?? false,
    ...(spec.source !== undefined ? { source: spec.source } : {}),
    file: path,
    sha256: sha256(text),
  };
}

/** The placeholders of one run, written as each argument needs them (shortest round-trip digits). */
export function substitute(argv: readonly string[], values: Readonly<Record<string, number | readonly number[]>>): string[] {
  return argv.map((arg) =>
    arg.replace(/\{(rtol|atol|steps|h)\}/g, (whole, name: string) => {
      const v = values[name];
      if (v === undefined) return whole;
      return typeof v === 'number' ? String(v) : v.join(',');
    }),
  );
}
