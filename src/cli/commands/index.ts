// One line per command; each file registers its own subcommand on the program.
import type { Command } from 'commander';
import { registerRun } from './run.js';
import { registerList } from './list.js';

/** Registers a subcommand; `setExit` raises the process exit code (max wins). */
export type RegisterCommand = (program: Command, setExit: (code: number) => void) => void;

export const commands: RegisterCommand[] = [registerRun, registerList];
