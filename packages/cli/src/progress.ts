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

/**
 * A progress callback for the estimators' `onProgress` (stage, done, total): one bar per stage,
 * labelled `label: stage`, replaced when the stage changes; a no-op when stderr is not a TTY.
 * Call the returned `stop` when the work is over.
 */
export function stageProgress(label: string): { onProgress: (stage: string, done: number, total: number) => void; stop: () => void } {
  if (!process.stderr.isTTY) return { onProgress: () => undefined, stop: () => undefined };
  let current: { stage: string; bar: Progress } | null = null;
  return {
    onProgress: (stage, done, total) => {
      if (current === null || current.stage !== stage) {
        current?.bar.stop();
        current = { stage, bar: progressBar(`${label}: ${stage}`, total) };
      }
      current.bar.update(done + 1);
    },
    stop: () => current?.bar.stop(),
  };
}
