import { EventEmitter } from 'node:events';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { installLastResortGuard, type GuardCause } from './last-resort-guard.ts';

afterEach(() => vi.useRealTimers());

function setup(
  options: {
    onSignal?: (signal: string) => void;
    hang?: boolean;
    heap?: { usedBytes: number; limitBytes: number };
  } = {},
) {
  const source = new EventEmitter();
  const causes: GuardCause[] = [];
  const exits: number[] = [];
  const lines: string[] = [];
  const heap = options.heap ?? { usedBytes: 0, limitBytes: 4e9 };
  const remove = installLastResortGuard({
    source,
    holder: {
      leaveSafe: (cause) => {
        causes.push(cause);
        return options.hang ? new Promise(() => undefined) : Promise.resolve({ ok: true });
      },
    },
    exit: (code) => exits.push(code),
    log: (line) => lines.push(line),
    onSignal: options.onSignal,
    memory: { read: () => heap, periodMs: 10 },
    deadlineMs: 50,
  });
  return { source, causes, exits, lines, heap, remove };
}

const settle = () => new Promise((resolve) => setTimeout(resolve, 5));

describe('last-resort guard', () => {
  it('makes the bench safe once on a crash, then exits 1; a second crash meanwhile is ignored', async () => {
    const g = setup();
    g.source.emit('uncaughtException', new RangeError('Maximum call stack size exceeded'));
    g.source.emit('unhandledRejection', new Error('second'));
    await settle();
    expect(g.causes).toEqual([
      { kind: 'crash', what: 'uncaughtException', error: 'RangeError: Maximum call stack size exceeded' },
    ]);
    expect(g.exits).toEqual([1]);
    g.remove();
  });

  it('on SIGTERM, SIGINT or SIGHUP makes the bench safe and exits 0', async () => {
    for (const signal of ['SIGTERM', 'SIGINT', 'SIGHUP']) {
      const g = setup();
      g.source.emit(signal);
      await settle();
      expect(g.causes).toEqual([{ kind: 'signal', signal }]);
      expect(g.exits).toEqual([0]);
      g.remove();
    }
  });

  it('hands the first signal to a process with its own clean stop, and takes the second itself', async () => {
    const seen: string[] = [];
    const g = setup({ onSignal: (signal) => seen.push(signal) });
    g.source.emit('SIGINT');
    await settle();
    expect(seen).toEqual(['SIGINT']);
    expect(g.causes).toEqual([]);
    g.source.emit('SIGINT');
    await settle();
    expect(g.causes).toEqual([{ kind: 'signal', signal: 'SIGINT' }]);
    g.remove();
  });

  it('acts when the heap comes within its headroom of the limit (15 %, at least 96 MiB)', async () => {
    const g = setup({ heap: { usedBytes: 3.3e9, limitBytes: 4e9 } });
    await new Promise((resolve) => setTimeout(resolve, 40));
    expect(g.causes).toEqual([]); // 700 MB left of 4 GB: more than 15 %
    g.heap.usedBytes = 3.5e9;
    await new Promise((resolve) => setTimeout(resolve, 40));
    expect(g.causes[0]).toEqual({
      kind: 'memory',
      usedMb: Math.round(3.5e9 / 2 ** 20),
      limitMb: Math.round(4e9 / 2 ** 20),
    });
    expect(g.exits).toEqual([1]);
    g.remove();
  });

  it('exits anyway when the safe state hangs past the deadline, and says so', async () => {
    const g = setup({ hang: true });
    g.source.emit('uncaughtException', new Error('boom'));
    await new Promise((resolve) => setTimeout(resolve, 120));
    expect(g.exits).toEqual([1]);
    expect(g.lines.join('\n')).toMatch(/did not finish within 0.05 s; exiting — check the supply now/);
    g.remove();
  });

  it('removes every listener it added', () => {
    const g = setup();
    g.remove();
    for (const event of ['uncaughtException', 'unhandledRejection', 'SIGTERM', 'SIGINT', 'SIGHUP'])
      expect(g.source.listenerCount(event)).toBe(0);
  });
});
