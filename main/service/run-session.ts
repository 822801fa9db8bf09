/**
 * One run from start to end: opens the run folder, hands the procedure a
 * sink that writes to the folder and also feeds the renderer (sample
 * batches, run events), and on the way out records the final status and
 * tells the renderer. The procedure itself owns the instruments' safety.
 */
import type { BenchEvent, RunKind, RunMeta } from '../../app/contract/bench-api.ts';
import { RunControl } from '../procedures/run-control.ts';
import type { SafeState } from '../../app/contract/plans.ts';
import type { EventBody, ProcedureEvent, ProcedureOutcome, RunSink, SampleRow } from '../procedures/types.ts';
import { cacheFinishedRun, createRun, type RunWriter } from '../store/index.ts';
import { isRunFileFault } from '../store/store-error.ts';
import type { BenchStatusTracker } from './bench-status.ts';
import type { OpenedBench, ProcedurePort } from './ports.ts';
import { SampleBatcher } from './sample-batcher.ts';

export interface RunSessionOptions {
  runsDir: string;
  kind: RunKind;
  plan: unknown;
  dutId: string;
  bench: OpenedBench;
  procedure: ProcedurePort;
  emit: (event: BenchEvent) => void;
  /** Real ms between sample batches. */
  batchMs?: number;
  /** Fed with the run's own rows and events, so the status strip needs no queries of its own. */
  status?: BenchStatusTracker;
}

export interface RunSession {
  meta: RunMeta;
  control: RunControl;
  /** Resolves with the final run.json once the run has ended and been recorded. */
  done: Promise<RunMeta>;
  /** The plan's safe state (default: 0 V, output off). */
  safe: SafeState;
  /** Records an event in the run (events.jsonl) and tells the renderer. */
  note(event: EventBody): void;
  /** Last resort when the procedure did not end: records the run as aborted without waiting for it. */
  abandon(): Promise<void>;
}

function teeSink(
  writer: RunWriter,
  batcher: SampleBatcher<SampleRow>,
  onEvent: (event: ProcedureEvent) => void,
): RunSink {
  return {
    appendSample(row) {
      writer.appendSample(row);
      batcher.push(row);
    },
    appendEvent(event) {
      writer.appendEvent(event);
      onEvent(event);
    },
    flush: () => writer.flush(),
  };
}

export async function startRunSession(options: RunSessionOptions): Promise<RunSession> {
  const { bench, emit } = options;
  // A plan refused on its own or against these instruments leaves no run folder.
  options.procedure.validate?.(options.plan, bench.roles);
  const control = new RunControl();
  const writer = await createRun({
    runsDir: options.runsDir,
    kind: options.kind,
    dut: { id: options.dutId },
    instruments: bench.connection.roles.map((role) => ({ role: role.role, idn: role.idn, address: role.address })),
    plan: options.plan,
    columns: options.procedure.columns,
    clock: bench.clock,
    onError: (error) => {
      emit({ type: 'error', message: `saving run samples failed: ${error.message}` });
      // A run folder gone or a disk refusing the run's files stops the run (through its safe state) here,
      // not at the end of a drift log that has nowhere to write.
      if (isRunFileFault(error)) control.stop('disk-fault');
    },
  });
  const runId = writer.id;
  const status = options.status;
  const batcher = new SampleBatcher<SampleRow>((rows) => {
    emit({ type: 'samples', runId, rows });
    const last = rows[rows.length - 1];
    if (last) status?.runRow(last);
  }, options.batchMs ?? 150);
  const sink = teeSink(writer, batcher, (event) => {
    // Samples before the event, so the renderer sees them in order.
    batcher.flushNow();
    emit({ type: 'run-event', runId, event });
    status?.runEvent(event);
  });
  const meta = writer.meta();
  emit({ type: 'run-started', meta });
  status?.runStarted(runId);

  let finished = false;
  const finishOnce = async (
    status: Exclude<RunMeta['status'], 'running'>,
    conditions?: ProcedureOutcome['conditions'],
  ): Promise<RunMeta> => {
    if (finished) return writer.meta();
    finished = true;
    // The conditions the sweep read around itself go into run.json, as `tunebench sweep` writes them (recorded-run.ts).
    const meta = await writer.finish(status, conditions ? { conditions } : undefined);
    // A big run's column cache is built in the background, so its first opening draws at once; best effort.
    void cacheFinishedRun(writer.dir, writer.rowsWritten()).catch(() => false);
    return meta;
  };
  const done = (async (): Promise<RunMeta> => {
    let outcome: ProcedureOutcome | null = null;
    try {
      outcome = await options.procedure.run({
        bench: bench.roles,
        plan: options.plan,
        clock: bench.clock,
        sink,
        control,
        runId,
        onProgress: (progress) => emit({ type: 'progress', progress }),
      });
    } catch (error) {
      const message = error instanceof Error ? error.message : String(error);
      sink.appendEvent({ time_s: writer.elapsedS(), type: 'error', error: message });
      emit({ type: 'error', message: `${options.kind} run ${runId} failed: ${message}` });
    }
    batcher.flushNow();
    if (outcome?.failure) emit({ type: 'error', message: `${options.kind} run ${runId}: ${outcome.failure.message}` });
    let final: RunMeta;
    try {
      final = await finishOnce(outcome?.status ?? 'aborted', outcome?.conditions);
    } catch (error) {
      const message = error instanceof Error ? error.message : String(error);
      emit({ type: 'error', message: `recording the end of run ${runId} failed: ${message}` });
      final = { ...writer.meta(), status: outcome?.status ?? 'aborted' };
    }
    emit({ type: 'run-ended', meta: final });
    return final;
  })();
  const planSafe = (options.plan as { safe?: SafeState } | null)?.safe;
  return {
    meta,
    control,
    done,
    safe: planSafe ?? { controlV: 0, outputOff: true },
    note: (event) => sink.appendEvent({ time_s: writer.elapsedS(), ...event }),
    abandon: async () => {
      batcher.flushNow();
      const final = await finishOnce('aborted');
      emit({ type: 'run-ended', meta: final });
    },
  };
}
