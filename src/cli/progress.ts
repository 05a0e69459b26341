// A progress line on a terminal for long sweeps; silent when stderr is not a TTY or when quiet.
import cliProgress from 'cli-progress';
import type { SweepProgress } from '../sweep/run.js';

export interface ProgressLine {
  update(p: SweepProgress): void;
  stop(): void;
}

export function progressLine(total: number, quiet: boolean): ProgressLine {
  if (quiet || !process.stderr.isTTY || total === 0) return { update() {}, stop() {} };
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
