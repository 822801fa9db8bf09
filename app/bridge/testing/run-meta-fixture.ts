/** A complete run.json object for bridge tests; override what a test cares about. */
export function runMetaFixture(dutId: string): Record<string, unknown> {
  return {
    schema: 'tunebench.run/1',
    id: 'r1',
    kind: 'drift',
    status: 'complete',
    startedAt: '2026-12-01T22:00:00Z',
    endedAt: '2026-12-02T06:00:00Z',
    dut: { id: dutId, notes: '' },
    instruments: [],
    plan: {},
    software: { version: '0.1.0' },
  };
}
