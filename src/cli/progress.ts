// Progress of a sweep on standard error: a bar on a terminal; elsewhere (CI logs, pipes) one line
// every few seconds with done/total, failures and the time left, so a long sweep is never silent.
import cliProgress from 'cli-progress';
import type { SweepProgress } from '../sweep/run.js';

export interface ProgressLine {
  update(p: SweepProgress): void;
  stop(): void;
}

/** Seconds between progress lines outside a terminal. */
export const PLAIN_PROGRESS_SECONDS = 5;

export interface ProgressSink {
  isTTY: boolean;
  write(text: string): void;
  /** Milliseconds (performance.now() by default). */
  now?: () => number;
}

function stderrSink(): ProgressSink {
  return { isTTY: Boolean(process.stderr.isTTY), write: (t) => void process.stderr.write(t) };
}

export function progressLine(total: number, quiet: boolean, sink: ProgressSink = stderrSink()): ProgressLine {
  if (quiet || total === 0) return { update() {}, stop() {} };
  return sink.isTTY ? barLine(total) : plainLines(total, sink);
}

function duration(seconds: number): string {
  if (!Number.isFinite(seconds)) return '?';
  const s = Math.round(seconds);
  return s < 60 ? `${s} s` : `${Math.floor(s / 60)} min ${String(s % 60).padStart(2, '0')} s`;
}

/** One line every PLAIN_PROGRESS_SECONDS; the time left assumes the remaining runs go as the finished ones did. */
export function plainLines(total: number, sink: ProgressSink): ProgressLine {
  const now = sink.now ?? (() => performance.now());
  const start = now();
  let last = start;
  return {
    update(p) {
      const t = now();
      if (t - last < PLAIN_PROGRESS_SECONDS * 1000 || p.done >= p.total) return;
      last = t;
      const elapsed = (t - start) / 1000;
      const left = (elapsed / p.done) * (p.total - p.done);
      sink.write(`stepgauge: ${p.done}/${p.total} runs, ${p.failed} failed, ${duration(elapsed)} elapsed, about ${duration(left)} left\n`);
    },
    stop() {},
  };
}

function barLine(total: number): ProgressLine {
  const bar = new cliProgress.SingleBar(
    {
      stream: process.stderr,
      format: ' {bar} {value}/{total} runs | {failed} failed | {duration_formatted} elapsed | eta {eta_formatted} | {current}',
      hideCursor: true,
      clearOnComplete: true,
      etaBuffer: 50,
    },
    cliProgress.Presets.shades_classic,
  );
  bar.start(total, 0, { failed: 0, current: '' });
  return {
    update(p) {
      bar.update(p.done, { failed: p.failed, current: `${p.last.problem} / ${p.last.method}` });
    },
    stop() {
      bar.stop();
    },
  };
}
