// One line per command; each file registers its own subcommand on the program.
import type { RegisterCommand } from './register.js';
import { registerRun } from './run.js';
import { registerList } from './list.js';
import { registerChoose } from './choose.js';
import { registerCheck } from './check.js';
import { registerBaseline } from './baseline.js';
import { registerMerge } from './merge.js';
import { registerReport } from './report.js';
import { registerEnvelope } from './envelope.js';

export type { RegisterCommand } from './register.js';

export const commands: RegisterCommand[] = [registerRun, registerList, registerChoose, registerCheck, registerBaseline, registerMerge, registerReport, registerEnvelope];
