/**
 * Type-level checks (issue 10 item 6): the contract's types come from its
 * schemas, and these lines pin the shapes CONTRACTS.md promises. If a schema
 * and a type part — a field dropped from connectionStateSchema, a status added
 * to run.json but not to the type — `npm run typecheck` fails here. The
 * runtime assertions only keep vitest honest about the file.
 */
import { describe, expect, it } from 'vitest';
import type { z } from 'zod';
import type { BenchEvent, ConnectionState, LiveReadout, ProgressInfo, RunMeta } from './bench-api.ts';
import { runMetaSchema } from './run-meta-schema.ts';
import { connectionStateSchema } from './state-schemas.ts';
import type { benchEventSchema } from './wire-schemas.ts';

/** True only when A and B are the same type (not merely assignable). */
type Equal<A, B> = (<T>() => T extends A ? 1 : 2) extends <T>() => T extends B ? 1 : 2 ? true : false;
function assertType<T extends true>(): T | undefined {
  return undefined;
}

assertType<
  Equal<
    ConnectionState,
    {
      connected: boolean;
      simulated: boolean;
      roles: { role: 'supply' | 'counter' | 'thermometer'; address: string; idn: string; simulated: boolean }[];
      error: string | null;
    }
  >
>();
assertType<
  Equal<
    LiveReadout,
    {
      controlSetV: number | null;
      controlMeasV: number | null;
      frequencyHz: number | null;
      temperatureC: number | null;
      timeS: number;
    }
  >
>();
assertType<
  Equal<
    ProgressInfo['latest'],
    {
      controlV: number;
      frequencyHz: number | null;
      status: 'ok' | 'no-signal' | 'timeout' | 'error';
      supplyV?: number | undefined;
    } | null
  >
>();
assertType<Equal<RunMeta['status'], 'running' | 'complete' | 'aborted' | 'interrupted' | 'failed'>>();
assertType<Equal<RunMeta['kind'], 'sweep' | 'drift' | 'pushing'>>();
assertType<
  Equal<
    Omit<RunMeta, 'plan'>,
    {
      schema: 'tunebench.run/1';
      id: string;
      kind: 'sweep' | 'drift' | 'pushing';
      status: 'running' | 'complete' | 'aborted' | 'interrupted' | 'failed';
      startedAt: string;
      endedAt: string | null;
      dut: { id: string; notes: string };
      instruments: { role: string; idn: string; address: string }[];
      software: { version: string };
      conditions?:
        | {
            dutSupplyV: { start: number | null; end: number | null };
            temperatureC: { start: number | null; end: number | null };
          }
        | undefined;
      failure?: string | undefined;
      simulated?: boolean | undefined;
    }
  >
>();
assertType<Equal<RunMeta['plan'], unknown>>();
// Every event the WebSocket schema passes is a BenchEvent, and every BenchEvent passes it.
assertType<z.output<typeof benchEventSchema> extends BenchEvent ? true : false>();
assertType<BenchEvent extends z.input<typeof benchEventSchema> ? true : false>();

describe('contract types from schemas', () => {
  it('a parsed run.json and connection state are the contract types, with no cast', () => {
    const meta: RunMeta = runMetaSchema.parse({
      schema: 'tunebench.run/1',
      id: 'r',
      kind: 'sweep',
      status: 'failed',
      startedAt: 't',
      endedAt: null,
      dut: { id: 'd', notes: '' },
      instruments: [],
      plan: {},
      software: { version: '0' },
      failure: 'cannot write samples.csv: ENOSPC',
    });
    const state: ConnectionState = connectionStateSchema.parse({
      connected: false,
      simulated: false,
      roles: [],
      error: null,
    });
    expect(meta.failure).toBe('cannot write samples.csv: ENOSPC');
    expect(state.error).toBeNull();
  });
});
