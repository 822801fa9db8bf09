/**
 * run.json of a run that has just started (status `running`), the one
 * definition for the desktop writer (./run-writer.ts) and the web edition's
 * (web/store/page-run-writer.ts). No Node here.
 */
import type { RunMeta } from '../../app/contract/bench-api.ts';
import { isSimulatedBench, RUN_SCHEMA } from '../../app/contract/run-meta-schema.ts';
import { SOFTWARE_VERSION } from './software-version.ts';
import type { CreateRunOptions } from './writer-types.ts';

export function startingRunMeta(
  options: Pick<CreateRunOptions, 'kind' | 'dut' | 'instruments' | 'plan' | 'softwareVersion'>,
  run: { id: string; startedAt: string; dutId: string },
): RunMeta {
  return {
    schema: RUN_SCHEMA,
    id: run.id,
    kind: options.kind,
    status: 'running',
    startedAt: run.startedAt,
    endedAt: null,
    dut: { id: run.dutId, notes: options.dut.notes ?? '' },
    instruments: options.instruments,
    plan: options.plan,
    software: { version: options.softwareVersion ?? SOFTWARE_VERSION },
    // Every export of a simulated run says so; run.json states it outright.
    ...(isSimulatedBench(options.instruments) ? { simulated: true } : {}),
  };
}
