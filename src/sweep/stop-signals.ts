// Ctrl-C during a sweep: the first one (or SIGTERM) starts no new run and lets the sweep write
// what finished; a second one leaves at once with exit 130.
import { exitProcess } from '../core/exit-guard.js';

export interface StopSignals {
  /** Starts listening; until then Ctrl-C keeps its default meaning (quit at once). */
  listen(): void;
  /** True once a stop was asked for. */
  stopping(): boolean;
  /** Stops listening. */
  close(): void;
}

/** `onFirst` says what happens next (the sweep is still running when it is called). */
export function stopSignals(onFirst: () => void): StopSignals {
  let stopping = false;
  const onSignal = () => {
    if (stopping) exitProcess(130);
    stopping = true;
    onFirst();
  };
  return {
    listen: () => {
      process.on('SIGINT', onSignal);
      process.on('SIGTERM', onSignal);
    },
    stopping: () => stopping,
    close: () => {
      process.off('SIGINT', onSignal);
      process.off('SIGTERM', onSignal);
    },
  };
}
