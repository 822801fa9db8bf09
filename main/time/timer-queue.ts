/**
 * Min-heap of timers ordered by due time, then by insertion order, so timers
 * due at the same instant fire in the order they were set (as the platform's
 * setTimeout does). Cancelled entries are removed lazily.
 */
export interface TimerEntry {
  readonly dueS: number;
  readonly seq: number;
  callback: (() => void) | null;
}

function before(a: TimerEntry, b: TimerEntry): boolean {
  return a.dueS < b.dueS || (a.dueS === b.dueS && a.seq < b.seq);
}

export class TimerQueue {
  readonly #heap: TimerEntry[] = [];
  #seq = 0;
  #live = 0;

  /** Number of timers still waiting to fire (cancelled ones excluded). */
  get size(): number {
    return this.#live;
  }

  push(dueS: number, callback: () => void): TimerEntry {
    const entry: TimerEntry = { dueS, seq: this.#seq++, callback };
    const heap = this.#heap;
    heap.push(entry);
    let i = heap.length - 1;
    while (i > 0) {
      const parent = (i - 1) >> 1;
      const p = heap[parent] as TimerEntry;
      if (!before(entry, p)) break;
      heap[i] = p;
      i = parent;
    }
    heap[i] = entry;
    this.#live++;
    return entry;
  }

  cancel(entry: TimerEntry): void {
    if (entry.callback === null) return;
    entry.callback = null;
    this.#live--;
  }

  /** The earliest live timer, or undefined. */
  peek(): TimerEntry | undefined {
    this.#dropCancelled();
    return this.#heap[0];
  }

  /** Removes and returns the earliest live timer; its callback is handed over. */
  pop(): { dueS: number; callback: () => void } | undefined {
    this.#dropCancelled();
    const top = this.#heap[0];
    if (!top || !top.callback) return undefined;
    this.#removeTop();
    const callback = top.callback;
    top.callback = null;
    this.#live--;
    return { dueS: top.dueS, callback };
  }

  #dropCancelled(): void {
    while (this.#heap.length > 0 && (this.#heap[0] as TimerEntry).callback === null) this.#removeTop();
  }

  #removeTop(): void {
    const heap = this.#heap;
    const last = heap.pop() as TimerEntry;
    if (heap.length === 0) return;
    let i = 0;
    const n = heap.length;
    for (;;) {
      const l = 2 * i + 1;
      if (l >= n) break;
      const r = l + 1;
      const child = r < n && before(heap[r] as TimerEntry, heap[l] as TimerEntry) ? r : l;
      const c = heap[child] as TimerEntry;
      if (!before(c, last)) break;
      heap[i] = c;
      i = child;
    }
    heap[i] = last;
  }
}
