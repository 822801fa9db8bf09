/** A finished drift run's run.json as main sends it, for tests of the messages that carry one. */
import type { RunMeta } from '../bench-api.ts';

export function driftRunMeta(id = 'r1'): RunMeta {
  return {
    schema: 'tunebench.run/1',
    id,
    kind: 'drift',
    status: 'complete',
    startedAt: '2026-11-20T18:00:00.000Z',
    endedAt: '2026-11-21T18:00:00.000Z',
    dut: { id: 'radio-lo', notes: '' },
    instruments: [],
    plan: {},
    software: { version: '0' },
  };
}
