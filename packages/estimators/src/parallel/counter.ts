/**
 * The loop every batch of the fit pool runs (./fitPool.ts): several threads take items from one
 * shared counter until none is left, so the split balances itself.
 */

/**
 * Take items 0 … items − 1 from `control` = [next item to take, tasks finished, tasks finished by
 * worker threads] (an Int32Array on a SharedArrayBuffer when threads share it) and run each;
 * `run(item)` returns how many of the batch's tasks it finished (1, or a group's size). After each
 * item the finished count is raised and waiters on it are woken. Returns the tasks this thread finished.
 */
export function takeItems(control: Int32Array, items: number, inWorker: boolean, run: (item: number) => number): number {
  let done = 0;
  for (;;) {
    const k = Atomics.add(control, 0, 1);
    if (k >= items) break;
    const n = run(k);
    if (inWorker) Atomics.add(control, 2, n);
    Atomics.add(control, 1, n);
    Atomics.notify(control, 1);
    done += n;
  }
  return done;
}
