import { describe, expect, it } from 'vitest';
import { RealClock } from './real-clock.ts';

describe('RealClock', () => {
  it('is monotonic seconds and sleeps about the asked time', async () => {
    const clock = new RealClock();
    const t0 = clock.now();
    await clock.sleep(0.03);
    const elapsed = clock.now() - t0;
    expect(elapsed).toBeGreaterThanOrEqual(0.025);
    expect(elapsed).toBeLessThan(1);
    expect(Number.isNaN(Date.parse(clock.wallTimeIso()))).toBe(false);
  });

  it('cancels a timer', async () => {
    const clock = new RealClock();
    let fired = false;
    const cancel = clock.setTimer(0.01, () => {
      fired = true;
    });
    cancel();
    await clock.sleep(0.03);
    expect(fired).toBe(false);
  });

  it('sleep rejects with AbortError when aborted', async () => {
    const clock = new RealClock();
    const controller = new AbortController();
    const pending = clock.sleep(10, controller.signal);
    setTimeout(() => controller.abort(), 5);
    await expect(pending).rejects.toMatchObject({ name: 'AbortError' });
  });
});
