import { describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { mkdtemp, open, writeFile, readFile, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { VirtualClock } from './virtual-clock.ts';
import { isAbortError } from './abort.ts';

describe('VirtualClock', () => {
  it('starts at startS and moves only when advanced', async () => {
    const clock = new VirtualClock({ startS: 5, startWallIso: '2026-03-01T12:00:00.000Z' });
    expect(clock.now()).toBe(5);
    await clock.advance(2.5);
    expect(clock.now()).toBe(7.5);
    expect(clock.wallTimeIso()).toBe('2026-03-01T12:00:02.500Z');
  });

  it('fires timers in due order, ties in the order set', async () => {
    const clock = new VirtualClock();
    const fired: string[] = [];
    clock.setTimer(3, () => fired.push(`c@${clock.now()}`));
    clock.setTimer(1, () => fired.push(`a@${clock.now()}`));
    clock.setTimer(2, () => fired.push(`b1@${clock.now()}`));
    clock.setTimer(2, () => fired.push(`b2@${clock.now()}`));
    clock.setTimer(0, () => fired.push(`z@${clock.now()}`));
    await clock.advance(2.5);
    expect(fired).toEqual(['z@0', 'a@1', 'b1@2', 'b2@2']);
    expect(clock.now()).toBe(2.5);
    await clock.advance(10);
    expect(fired.at(-1)).toBe('c@3');
    expect(clock.pendingTimers).toBe(0);
  });

  it('keeps order over many random timers (heap check)', async () => {
    const clock = new VirtualClock();
    const due: number[] = [];
    const fired: number[] = [];
    let x = 12345;
    for (let i = 0; i < 500; i++) {
      x = (x * 1103515245 + 12345) % 2147483648;
      const d = (x % 1000) / 10;
      due.push(d);
      clock.setTimer(d, () => fired.push(clock.now()));
    }
    await clock.advance(200);
    expect(fired).toEqual([...due].sort((a, b) => a - b));
  });

  it('cancels timers, including cancel after fire (no-op) and double cancel', async () => {
    const clock = new VirtualClock();
    const fired: number[] = [];
    const cancelA = clock.setTimer(1, () => fired.push(1));
    const cancelB = clock.setTimer(2, () => fired.push(2));
    clock.setTimer(3, () => fired.push(3));
    cancelA();
    cancelA();
    expect(clock.pendingTimers).toBe(2);
    await clock.advance(2);
    cancelB();
    await clock.advance(5);
    expect(fired).toEqual([2, 3]);
    expect(clock.pendingTimers).toBe(0);
  });

  it('fires nested timers set by callbacks within the same advance', async () => {
    const clock = new VirtualClock();
    const fired: number[] = [];
    clock.setTimer(1, () => {
      fired.push(clock.now());
      clock.setTimer(0.5, () => {
        fired.push(clock.now());
        clock.setTimer(0, () => fired.push(clock.now()));
      });
      clock.setTimer(5, () => fired.push(clock.now()));
    });
    await clock.advance(2);
    expect(fired).toEqual([1, 1.5, 1.5]);
    await clock.advance(10);
    expect(fired).toEqual([1, 1.5, 1.5, 6]);
  });

  it('lets async chains woken by one timer set the next before moving on', async () => {
    const clock = new VirtualClock();
    const times: number[] = [];
    const loop = async (): Promise<void> => {
      for (let i = 0; i < 5; i++) {
        await clock.sleep(1);
        await Promise.resolve();
        await new Promise((resolve) => setImmediate(resolve));
        times.push(clock.now());
      }
    };
    const done = loop();
    await clock.advance(5);
    await done;
    expect(times).toEqual([1, 2, 3, 4, 5]);
  });

  it('sleep rejects with AbortError on abort, and at once if already aborted', async () => {
    const clock = new VirtualClock();
    const controller = new AbortController();
    const pending = clock.sleep(10, controller.signal);
    await clock.advance(3);
    controller.abort();
    await expect(pending).rejects.toSatisfy(isAbortError);
    expect(clock.pendingTimers).toBe(0);
    await expect(clock.sleep(1, controller.signal)).rejects.toMatchObject({ name: 'AbortError' });
  });

  it('sleep resolves at exactly the due time and detaches its abort listener', async () => {
    const clock = new VirtualClock();
    const controller = new AbortController();
    let wokeAt = -1;
    const pending = clock.sleep(4, controller.signal).then(() => {
      wokeAt = clock.now();
    });
    await clock.advance(4);
    await pending;
    expect(wokeAt).toBe(4);
    controller.abort(); // must not throw or reject anything now
  });

  it('rejects bad arguments with a message naming the argument', async () => {
    const clock = new VirtualClock();
    expect(() => clock.setTimer(Number.NaN, () => undefined)).toThrow(/seconds/);
    await expect(clock.advance(-1)).rejects.toThrow(/seconds must be ≥ 0/);
    expect(() => new VirtualClock({ startWallIso: 'yesterday' })).toThrow(/startWallIso/);
  });

  it('runUntil jumps across idle gaps and returns the value', async () => {
    const clock = new VirtualClock();
    const work = async (): Promise<number> => {
      await clock.sleep(100);
      await clock.sleep(0.001);
      return clock.now();
    };
    await expect(clock.runUntil(work())).resolves.toBeCloseTo(100.001, 9);
  });

  it('runUntil passes through rejection and reports a deadlock', async () => {
    const clock = new VirtualClock();
    const failing = (async () => {
      await clock.sleep(2);
      throw new Error('boom');
    })();
    await expect(clock.runUntil(failing)).rejects.toThrow('boom');
    const never = new Promise<void>(() => undefined);
    await expect(clock.runUntil(never)).rejects.toThrow(/no timer left/);
  });

  it('runUntil respects limitS', async () => {
    const clock = new VirtualClock();
    await expect(clock.runUntil(clock.sleep(1000), { limitS: 10 })).rejects.toThrow(/limit of 10 s/);
    expect(clock.now()).toBe(0);
  });

  it('does not overtake real file I/O in flight', async () => {
    // A timeout racing a file write: the write must win, because the clock
    // waits for pending requests before jumping to the timeout.
    const clock = new VirtualClock();
    const path = join(tmpdir(), `tunebench-vclock-${process.pid}.txt`);
    const race = async (): Promise<string> => {
      const timeout = clock.sleep(5).then(() => 'timeout');
      const io = (async () => {
        await writeFile(path, 'x'.repeat(100_000));
        const text = await readFile(path, 'utf8');
        return `io:${text.length}`;
      })();
      return Promise.race([timeout, io]);
    };
    try {
      await expect(clock.runUntil(race())).resolves.toBe('io:100000');
      expect(clock.now()).toBe(0);
    } finally {
      await rm(path, { force: true });
    }
  });

  it.skipIf(process.platform === 'win32')(
    'does not overtake a slow file request however many loop turns it takes (an fsync on a busy disk)',
    { timeout: 20_000 },
    async () => {
      // A request that stays in the thread pool until the test lets it go: opening a FIFO for reading blocks
      // until a writer opens it. Before the fix the idle check gave up after 10,000 loop turns (tens of ms)
      // with the request still in flight and the clock jumped to its next timer — the campaign's run-to-run
      // variation (a slow fsync of campaign.json moved the whole campaign by a stale 2 s reply deadline).
      const dir = await mkdtemp(join(tmpdir(), 'tunebench-vclock-fifo-'));
      const fifo = join(dir, 'slow');
      execFileSync('mkfifo', [fifo]);
      const clock = new VirtualClock({ autoAdvance: true });
      let fired = false;
      clock.setTimer(2, () => {
        fired = true;
      });
      const reader = open(fifo, 'r');
      let released = false;
      const release = async (): Promise<void> => {
        if (released) return;
        released = true;
        const writer = await open(fifo, 'w');
        await (await reader).close();
        await writer.close();
      };
      try {
        // Far longer in real time than 10,000 turns of the loop.
        await new Promise((resolve) => setTimeout(resolve, 400));
        expect(fired).toBe(false);
        expect(clock.now()).toBe(0);
        await release();
        // With the request done the loop is idle again and the clock moves on.
        await new Promise((resolve) => setTimeout(resolve, 50));
        expect(fired).toBe(true);
        expect(clock.now()).toBe(2);
      } finally {
        await release();
        clock.setAutoAdvance(false);
        await rm(dir, { recursive: true, force: true });
      }
    },
  );

  it('autoAdvance runs a procedure without being driven', async () => {
    const clock = new VirtualClock({ autoAdvance: true });
    const stamps: number[] = [];
    for (let i = 0; i < 3; i++) {
      await clock.sleep(60);
      stamps.push(clock.now());
    }
    expect(stamps).toEqual([60, 120, 180]);
    clock.setAutoAdvance(false);
    let fired = false;
    clock.setTimer(1, () => {
      fired = true;
    });
    await new Promise((resolve) => setTimeout(resolve, 20));
    expect(fired).toBe(false);
    clock.setAutoAdvance(true);
    await new Promise((resolve) => setTimeout(resolve, 20));
    expect(fired).toBe(true);
  });

  it('runs a 12-hour log at 1 s intervals (43,200 iterations) to completion', async () => {
    const clock = new VirtualClock();
    const log = async (): Promise<number> => {
      let n = 0;
      const endS = 12 * 3600;
      while (clock.now() < endS) {
        // Several awaits per iteration, as a drift log has (gate, write, sleep).
        await clock.sleep(0.1);
        await Promise.resolve();
        await clock.sleep(0.9);
        n++;
      }
      return n;
    };
    await expect(clock.runUntil(log())).resolves.toBe(43_200);
    expect(clock.now()).toBeCloseTo(43_200, 6);
  });
});
