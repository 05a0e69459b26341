// The command line as the user typed it (shell-quoted where needed), for records that must say
// exactly what was asked: decision records and run reports.
let args: readonly string[] = [];

export function setCommandLine(argv: readonly string[]): void {
  args = [...argv];
}

function quote(a: string): string {
  return /^[A-Za-z0-9_@%+=:,./-]+$/.test(a) ? a : `'${a.replace(/'/g, `'\\''`)}'`;
}

export function commandLine(): string {
  return ['stepgauge', ...args.map(quote)].join(' ');
}
