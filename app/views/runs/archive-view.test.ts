import { describe, expect, it } from 'vitest';
import type { RunMeta } from '../../contract/bench-api.ts';
import { archiveRows, NO_FILTER } from './archive-view.ts';

function run(id: string, dut: string, kind: RunMeta['kind'], status: RunMeta['status'], startedAt: string): RunMeta {
  return {
    schema: 'tunebench.run/1',
    id,
    kind,
    status,
    startedAt,
    endedAt: null,
    dut: { id: dut, notes: '' },
    instruments: [],
    plan: {},
    software: { version: '0' },
  };
}

const RUNS = [
  run('a', 'lo-400m-03', 'sweep', 'complete', '2026-03-02T09:00:00Z'),
  run('b', 'clkmul-vco-01', 'sweep', 'aborted', '2026-03-03T10:00:00Z'),
  run('c', 'clkmul-vco-01', 'drift', 'complete', '2026-03-04T11:00:00Z'),
  run('d', 'clkmul-vco-02', 'sweep', 'complete', '2026-03-05T12:00:00Z'),
];
const KVCO = new Map([
  ['a', 4.1e6],
  ['d', 9.7e3],
]);

describe('run archive sort and filter', () => {
  it('newest first by default; by DUT text, kind, status and date range', () => {
    expect(archiveRows(RUNS, NO_FILTER, { key: 'started', descending: true }, KVCO).map((r) => r.id)).toEqual([
      'd',
      'c',
      'b',
      'a',
    ]);
    expect(
      archiveRows(RUNS, { ...NO_FILTER, text: 'CLKMUL' }, { key: 'started', descending: true }, KVCO).map((r) => r.id),
    ).toEqual(['d', 'c', 'b']);
    expect(
      archiveRows(
        RUNS,
        { ...NO_FILTER, kind: 'sweep', status: 'complete' },
        { key: 'started', descending: false },
        KVCO,
      ).map((r) => r.id),
    ).toEqual(['a', 'd']);
    expect(
      archiveRows(
        RUNS,
        { ...NO_FILTER, from: '2026-03-03', to: '2026-03-04' },
        { key: 'started', descending: true },
        KVCO,
      ).map((r) => r.id),
    ).toEqual(['c', 'b']);
  });

  it('by Kvco, runs without one last whichever the direction', () => {
    expect(archiveRows(RUNS, NO_FILTER, { key: 'kvco', descending: true }, KVCO).map((r) => r.id)).toEqual([
      'a',
      'd',
      'c',
      'b',
    ]);
    expect(archiveRows(RUNS, NO_FILTER, { key: 'kvco', descending: false }, KVCO).map((r) => r.id)).toEqual([
      'd',
      'a',
      'c',
      'b',
    ]);
  });
});
