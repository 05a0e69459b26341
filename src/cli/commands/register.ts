// The shape of one command's registration, apart from the list of commands so a command's file
// never imports the list that imports it.
import type { Command } from 'commander';

/** Registers a subcommand; `setExit` raises the process exit code (max wins). */
export type RegisterCommand = (program: Command, setExit: (code: number) => void) => void;
