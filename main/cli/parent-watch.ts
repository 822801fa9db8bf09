/**
 * Long-running commands (sim, serve, drift, sweep…) stop when the process
 * that started them goes away. `npx tunebench sim` runs node under npm and a
 * shell; a SIGTERM to npx ends npm but reached no further, and the orphaned
 * node kept holding its ports. An orphan is re-parented (to init or a
 * subreaper), so its parent pid changes: polling it is portable and cheap.
 */

export interface ParentWatchOptions {
  /** How often to look, ms (default 1000). */
  intervalMs?: number;
  /** The current parent pid (default process.ppid; injected in tests). */
  parentPid?: () => number;
}

/** Calls `onGone` once when the parent pid changes. Returns a disposer. The timer never keeps the process alive. */
export function watchParent(onGone: () => void, options: ParentWatchOptions = {}): () => void {
  const parentPid = options.parentPid ?? (() => process.ppid);
  const original = parentPid();
  const timer = setInterval(() => {
    if (parentPid() === original) return;
    clearInterval(timer);
    onGone();
  }, options.intervalMs ?? 1000);
  timer.unref();
  return () => clearInterval(timer);
}
