// One line per command; each file registers its own subcommand on the program.
import type { Command } from 'commander';
import { registerRun } from './run.js';
import { registerList } from './list.js';
import { registerChoose } from './choose.js';
import { registerCheck } from './check.js';
import { registerBaseline } from './baseline.js';
import { registerMerge } from './merge.js';
import { registerReport } from './report.js';

/** Registers a subcommand; `setExit` raises the process exit code (max wins). */
export type RegisterCommand = (program: Command, setExit: (code: number) => void) => void;

export const commands: RegisterCommand[] = [registerRun, registerList, registerChoose, registerCheck, registerBaseline, registerMerge, registerReport];
