import { describe, expect, it } from 'vitest';
import { SampleBatcher, type BatchTimers } from './sample-batcher.ts';

/** Timers that fire only when the test says so. */
function manualTimers() {
  const due: { callback: () => void; delayMs: number; cancelled: boolean }[] = [];
  const timers: BatchTimers = {
    setTimeout: (callback, delayMs) => {
      const entry = { callback, delayMs, cancelled: false };
      due.push(entry);
      return entry;
    },
    clearTimeout: (handle) => void ((handle as { cancelled: boolean }).cancelled = true),
  };
  const fire = (): void => {
    for (const entry of due.splice(0)) if (!entry.cancelled) entry.callback();
  };
  return { timers, due, fire };
}

describe('SampleBatcher', () => {
  it('sends rows in one batch per interval, in order, arming one timer per batch', () => {
    const clock = manualTimers();
    const sent: number[][] = [];
    const batcher = new SampleBatcher<number>((rows) => sent.push(rows), 150, clock.timers);
    for (let i = 0; i < 7; i++) batcher.push(i);
    expect(clock.due).toHaveLength(1);
    expect(clock.due[0]?.delayMs).toBe(150);
    expect(sent).toEqual([]);
    clock.fire();
    batcher.push(7);
    clock.fire();
    expect(sent).toEqual([[0, 1, 2, 3, 4, 5, 6], [7]]);
    expect(batcher.pending).toBe(0);
  });

  it('flushNow sends what is pending at once and cancels the timer; nothing pending sends nothing', () => {
    const clock = manualTimers();
    const sent: string[][] = [];
    const batcher = new SampleBatcher<string>((rows) => sent.push(rows), 200, clock.timers);
    batcher.flushNow();
    batcher.push('a');
    batcher.push('b');
    batcher.flushNow();
    clock.fire();
    expect(sent).toEqual([['a', 'b']]);
    expect(() => new SampleBatcher<string>(() => undefined, 0)).toThrow(/intervalMs/);
  });
});
