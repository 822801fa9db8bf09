import { describe, expect, it } from 'vitest';
import { releaseScratchColumns, scratchColumn } from './scratch-columns.ts';

describe('scratch columns', () => {
  it('each slot is its own memory, reused while big enough, grown when not, and let go by release', () => {
    const a = scratchColumn(0, 1000);
    const b = scratchColumn(1, 1000);
    expect(a).toHaveLength(1000);
    expect(a.buffer).not.toBe(b.buffer);
    a.fill(1);
    b.fill(2);
    expect(a[999]).toBe(1); // writing slot 1 left slot 0 alone
    const again = scratchColumn(0, 10);
    expect(again.buffer).toBe(a.buffer); // reused: no new memory
    expect(again).toHaveLength(10);
    const bigger = scratchColumn(0, 5000);
    expect(bigger.buffer).not.toBe(a.buffer);
    expect(bigger).toHaveLength(5000);
    releaseScratchColumns();
    expect(scratchColumn(0, 10).buffer).not.toBe(bigger.buffer);
    releaseScratchColumns();
  });
});
