// The thread that talks to users' programs. Method.solve is synchronous, child processes are not:
// the main thread posts one job here and sleeps on a shared flag (see bridge.ts) while this
// thread's own event loop starts the program, feeds it, reads it, and enforces the timeout.
// Every program runs in its own process group, so a timeout ends the program and its children.
import { spawn, type ChildProcessWithoutNullStreams } from 'node:child_process';
import { parentPort, workerData, type MessagePort } from 'node:worker_threads';
import type { HostJob, HostReply } from './host-messages.js';

const { flag, replies } = workerData as { flag: SharedArrayBuffer; replies: MessagePort };
const signal = new Int32Array(flag);

/** Keep at most this much of a program's error output per request (its tail). */
const STDERR_KEEP = 16 * 1024;

function reply(r: HostReply): void {
  replies.postMessage(r);
  Atomics.store(signal, 0, 1);
  Atomics.notify(signal, 0);
}

function startProcess(argv: readonly string[], cwd: string): ChildProcessWithoutNullStreams {
  return spawn(argv[0]!, argv.slice(1), { cwd, detached: true, stdio: ['pipe', 'pipe', 'pipe'] });
}

function killGroup(child: ChildProcessWithoutNullStreams): void {
  if (child.pid === undefined) return;
  try {
    process.kill(-child.pid, 'SIGKILL');
  } catch {
    // already gone
  }
}

class Tail {
  text = '';
  add(chunk: Buffer | string): void {
    this.text += chunk.toString();
    if (this.text.length > STDERR_KEEP) this.text = this.text.slice(-STDERR_KEEP);
  }
}

/** One process per request: write the request, close stdin, read everything until it exits. */
function runOnce(job: Extract<HostJob, { op: 'once' }>): void {
  const started = performance.now();
  let child: ChildProcessWithoutNullStreams;
  try {
    child = startProcess(job.argv, job.cwd);
  } catch (e) {
    reply({ kind: 'not-started', message: (e as Error).message });
    return;
  }
  const out: Buffer[] = [];
  const err = new Tail();
  let timedOut = false;
  let done = false;
  const timer = setTimeout(() => {
    timedOut = true;
    killGroup(child);
  }, job.timeoutMs);
  child.stdout.on('data', (c: Buffer) => out.push(c));
  child.stderr.on('data', (c: Buffer) => err.add(c));
  // A program that ignores its input may exit before reading it: that is not an error.
  child.stdin.on('error', () => {});
  child.on('error', (e) => {
    if (done) return;
    done = true;
    clearTimeout(timer);
    reply({ kind: 'not-started', message: e.message });
  });
  child.on('close', (code, sig) => {
    if (done) return;
    done = true;
    clearTimeout(timer);
    const wallSeconds = (performance.now() - started) / 1000;
    killGroup(child); // anything the program left running in its group
    reply({ kind: 'finished', stdout: Buffer.concat(out).toString('utf8'), stderr: err.text, code, signal: sig, timedOut, wallSeconds });
  });
  child.stdin.end(job.input);
}

/** A process kept for a sweep (protocol `lines`): one request line in, one response line out. */
interface LineProcess {
  child: ChildProcessWithoutNullStreams;
  buffered: string;
  err: Tail;
  exited: { code: number | null; signal: NodeJS.Signals | null } | null;
  waiting: ((line: string | null) => void) | null;
}

const lineProcesses = new Map<string, LineProcess>();

function lineProcess(key: string, argv: readonly string[], cwd: string): LineProcess | string {
  const known = lineProcesses.get(key);
  if (known && !known.exited) return known;
  let child: ChildProcessWithoutNullStreams;
  try {
    child = startProcess(argv, cwd);
  } catch (e) {
    return (e as Error).message;
  }
  const lp: LineProcess = { child, buffered: '', err: new Tail(), exited: null, waiting: null };
  child.stdout.on('data', (c: Buffer) => {
    lp.buffered += c.toString('utf8');
    deliver(lp);
  });
  child.stderr.on('data', (c: Buffer) => lp.err.add(c));
  child.stdin.on('error', () => {});
  child.on('error', (e) => {
    lp.exited = { code: null, signal: null };
    lp.err.add(`could not start: ${e.message}\n`);
    lp.waiting?.(null);
  });
  child.on('close', (code, sig) => {
    lp.exited = { code, signal: sig };
    lp.waiting?.(null);
  });
  lineProcesses.set(key, lp);
  return lp;
}

function deliver(lp: LineProcess): void {
  if (!lp.waiting) return;
  const nl = lp.buffered.indexOf('\n');
  if (nl < 0) return;
  const line = lp.buffered.slice(0, nl);
  lp.buffered = lp.buffered.slice(nl + 1);
  const w = lp.waiting;
  lp.waiting = null;
  w(line);
}

function runLine(job: Extract<HostJob, { op: 'line' }>): void {
  const lp = lineProcess(job.key, job.argv, job.cwd);
  if (typeof lp === 'string') {
    reply({ kind: 'not-started', message: lp });
    return;
  }
  lp.err.text = '';
  const started = performance.now();
  let finished = false;
  const timer = setTimeout(() => {
    if (finished) return;
    finished = true;
    lp.waiting = null;
    killGroup(lp.child);
    lineProcesses.delete(job.key);
    reply({ kind: 'finished', stdout: '', stderr: lp.err.text, code: null, signal: null, timedOut: true, wallSeconds: (performance.now() - started) / 1000 });
  }, job.timeoutMs);
  lp.waiting = (line) => {
    if (finished) return;
    finished = true;
    clearTimeout(timer);
    const wallSeconds = (performance.now() - started) / 1000;
    if (line === null) {
      lineProcesses.delete(job.key);
      killGroup(lp.child);
      const ex = lp.exited ?? { code: null, signal: null };
      reply({ kind: 'finished', stdout: lp.buffered, stderr: lp.err.text, code: ex.code, signal: ex.signal, timedOut: false, wallSeconds, closed: true });
      return;
    }
    reply({ kind: 'finished', stdout: line, stderr: lp.err.text, code: 0, signal: null, timedOut: false, wallSeconds, ...(lp.child.pid ? { pid: lp.child.pid } : {}) });
  };
  lp.child.stdin.write(job.input.endsWith('\n') ? job.input : `${job.input}\n`);
  if (lp.exited) lp.waiting(null);
  else deliver(lp);
}

function stopAll(): void {
  for (const lp of lineProcesses.values()) {
    lp.child.stdin.end();
    killGroup(lp.child);
  }
  lineProcesses.clear();
}

parentPort!.on('message', (job: HostJob) => {
  try {
    if (job.op === 'once') runOnce(job);
    else if (job.op === 'line') runLine(job);
    else {
      stopAll();
      reply({ kind: 'stopped' });
    }
  } catch (e) {
    reply({ kind: 'not-started', message: (e as Error).message });
  }
});
