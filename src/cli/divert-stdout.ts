// While user code may run in this process (modules loading, runs at --jobs 1), what it prints goes
// to standard error: standard output carries only stepgauge's own output, so `run --json` stays
// valid JSON. Workers do the same on their side (src/sweep/worker.ts).

export interface DivertedStdout {
  /** Writes to the real standard output. */
  write(text: string): void;
  /** Puts standard output back. */
  restore(): void;
}

export function divertStdout(): DivertedStdout {
  const original = process.stdout.write;
  process.stdout.write = ((chunk: string | Uint8Array, ...rest: never[]) => process.stderr.write(chunk, ...rest)) as typeof process.stdout.write;
  let restored = false;
  return {
    write: (text) => {
      original.call(process.stdout, text);
    },
    restore: () => {
      if (restored) return;
      restored = true;
      process.stdout.write = original;
    },
  };
}
