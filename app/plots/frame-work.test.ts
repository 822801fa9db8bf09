import { describe, expect, it } from 'vitest';
import { plotWorkSince, recordPlotWork } from './frame-work.ts';

describe('plot work ring', () => {
  it('keeps only the latest 1,024 updates and returns those that ended since a time, oldest first', () => {
    // Update i starts at 10·i ms and takes 1 + (i mod 3) ms.
    for (let i = 0; i < 1100; i++) recordPlotWork(10 * i, 10 * i + 1 + (i % 3));
    const all = plotWorkSince(0);
    expect(all).toHaveLength(1024);
    expect(all[0]).toBe(1 + (76 % 3)); // the oldest kept is update 1100 − 1024 = 76
    expect(all.at(-1)).toBe(1 + (1099 % 3));
    // Updates ending at or after 10,951 ms: 1095 (ends 10,951) to 1099.
    expect(plotWorkSince(10_951)).toEqual([1095, 1096, 1097, 1098, 1099].map((i) => 1 + (i % 3)));
  });
});
