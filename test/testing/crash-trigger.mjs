// Loaded into a child `tunebench serve` by tests only (node --import), never
// by the product: on SIGUSR2 it does to the process what
// TUNEBENCH_TEST_TRIGGER says — "throw" (an uncaught exception), "reject"
// (an unhandled rejection) or "memory" (allocates until the heap fills) —
// so a test can crash a real server mid-run and check what the bench was left in.
import { getHeapStatistics } from 'node:v8';
import { isMainThread } from 'node:worker_threads';

if (isMainThread) {
  const mode = process.env.TUNEBENCH_TEST_TRIGGER;
  process.on('SIGUSR2', () => {
    if (mode === 'throw')
      setTimeout(() => {
        throw new Error('test crash: thrown on purpose');
      }, 0);
    else if (mode === 'reject') void Promise.reject(new Error('test crash: rejected on purpose'));
    else if (mode === 'memory') {
      const hoard = [];
      const grow = () => {
        // About 1 MiB of live objects every 20 ms, kept, up to 64 MiB below the heap limit (past the
        // guard's threshold, short of V8's own end): the heap watch must see the pressure and act.
        const heap = getHeapStatistics();
        if (heap.used_heap_size < heap.heap_size_limit - 64 * 2 ** 20) {
          for (let i = 0; i < 8; i += 1) hoard.push(new Array(16384).fill(hoard.length + i + 0.5));
        }
        setTimeout(grow, 20);
      };
      grow();
    }
  });
}
