/**
 * Progress for long loops: a bar on stderr (cli-progress) when stderr is a terminal, nothing
 * otherwise, so pipelines and logs stay clean.
 */
import { SingleBar, Presets } from "cli-progress";

/** A counter that draws itself only on a terminal. */
export interface Progress {
  /** Set the number of finished items. */
  update(done: number): void;
  stop(): void;
}

/** A progress bar of `total` items labelled `label` (a no-op when stderr is not a TTY or total is 0). */
export function progressBar(label: string, total: number, initial = 0): Progress {
  if (!process.stderr.isTTY || total <= 0) return { update: () => undefined, stop: () => undefined };
  const bar = new SingleBar(
    { format: `${label} [{bar}] {value}/{total} · {duration_formatted} elapsed, ETA {eta_formatted}`, stream: process.stderr, hideCursor: true, clearOnComplete: false },
    Presets.shades_classic,
  );
  bar.start(total, initial);
  return { update: (done) => bar.update(done), stop: () => bar.stop() };
}
