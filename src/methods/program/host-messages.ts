// The messages between the main thread and the program host thread (bridge.ts, host-thread.ts).

export type HostJob =
  /** One process for one request (protocol `once`): input is written to stdin, which is then closed. */
  | { op: 'once'; argv: readonly string[]; cwd: string; input: string; timeoutMs: number }
  /** One request line to the process kept under `key` (protocol `lines`), started if need be. */
  | { op: 'line'; key: string; argv: readonly string[]; cwd: string; input: string; timeoutMs: number }
  /** End every kept process. */
  | { op: 'stop' };

export type HostReply =
  | { kind: 'not-started'; message: string }
  | {
      kind: 'finished';
      /** Everything the program wrote (once), or its one response line (lines). */
      stdout: string;
      /** The tail of what it wrote to stderr during this request. */
      stderr: string;
      code: number | null;
      signal: NodeJS.Signals | null;
      timedOut: boolean;
      /** From the request written to the response read (or the process's exit). */
      wallSeconds: number;
      /** Protocol `lines`: the kept process closed its output instead of answering. */
      closed?: boolean;
      /** Protocol `lines`: the kept process's id, ended when this process exits. */
      pid?: number;
    }
  | { kind: 'stopped' };
