// A synchronous call into the program host thread. Method.solve is synchronous everywhere in
// stepgauge (measure, time, choose, certify), so a program's run blocks this thread on a shared
// flag until the host thread, which does the asynchronous process work, posts its reply.
import { existsSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { MessageChannel, receiveMessageOnPort, Worker, type MessagePort } from 'node:worker_threads';
import type { HostJob, HostReply } from './host-messages.js';

/** The compiled host thread: threads cannot load TypeScript, so tests running from src use dist. */
function hostFile(): string {
  const here = fileURLToPath(import.meta.url);
  if (here.endsWith('.js')) return join(dirname(here), 'host-thread.js');
  const built = join(dirname(here), '..', '..', '..', 'dist', 'src', 'methods', 'program', 'host-thread.js');
  if (!existsSync(built)) throw new Error(`external programs need the compiled host at ${built}; run npm run build`);
  return built;
}

interface Host {
  worker: Worker;
  signal: Int32Array;
  replies: MessagePort;
}

let host: Host | null = null;
/** Kept processes (protocol `lines`): ended with their process groups when this process exits. */
const keptPids = new Set<number>();

function endKept(): void {
  for (const pid of keptPids) {
    try {
      process.kill(-pid, 'SIGKILL');
    } catch {
      // already gone
    }
  }
  keptPids.clear();
}

function startHost(): Host {
  const flag = new SharedArrayBuffer(4);
  const channel = new MessageChannel();
  const worker = new Worker(hostFile(), { workerData: { flag, replies: channel.port2 }, transferList: [channel.port2] });
  worker.unref();
  process.once('exit', endKept);
  return { worker, signal: new Int32Array(flag), replies: channel.port1 };
}

/** Runs one job on the host thread and returns its reply; blocks this thread meanwhile. */
export function callHost(job: HostJob): HostReply {
  host ??= startHost();
  const { worker, signal, replies } = host;
  Atomics.store(signal, 0, 0);
  worker.postMessage(job);
  for (;;) {
    // Bounded waits, so a host thread that died is noticed instead of waited on forever.
    Atomics.wait(signal, 0, 0, 1000);
    const got = receiveMessageOnPort(replies);
    if (got) {
      const r = got.message as HostReply;
      if (r.kind === 'finished' && r.pid !== undefined) keptPids.add(r.pid);
      return r;
    }
    if (Atomics.load(signal, 0) === 1) continue;
    if (!isAlive(worker)) {
      host = null;
      throw new Error('the program host thread stopped');
    }
  }
}

function isAlive(worker: Worker): boolean {
  return worker.threadId >= 0;
}

/** Ends every kept program process (protocol `lines`); the next request starts a fresh one. */
export function stopKeptPrograms(): void {
  if (!host) return;
  callHost({ op: 'stop' });
  keptPids.clear();
}
