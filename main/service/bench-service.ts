/**
 * The BenchApi as main/ implements it: one bench connection at a time, one
 * run at a time, run folders through the store, procedures through their
 * ports, and a stream of pushed events (connection, live readouts while idle,
 * run start/progress/sample batches/events/end). Arguments arrive already
 * validated by the carrier (IPC gate or WebSocket) via the contract schemas.
 */
import type { BenchApi, BenchEvent, ConnectionState, RunKind, RunMeta } from '../../app/contract/bench-api.ts';
import type { BenchConfig } from '../../app/contract/plans.ts';
import type { RunPreview } from '../../app/contract/run-preview.ts';
import { goSafe } from '../procedures/safe-state.ts';
import { sanitiseText } from '../../app/contract/excerpt.ts';
import { checkApiBench, type AddressPolicy } from './address-policy.ts';
import { BenchApiError } from './errors.ts';
import type { ImportStream } from './import-off-thread.ts';
import type { BenchHolder, GuardCause } from './last-resort-guard.ts';
import { EventHub } from './event-hub.ts';
import { BenchStatusTracker } from './bench-status.ts';
import { LivePoller } from './live-readout.ts';
import { applyManualControl } from './manual-control.ts';
import type { CampaignMethods, OpenedBench, ServicePorts } from './ports.ts';
import { startRunSession, type RunSession } from './run-session.ts';
import { createRunOpener, type DriftAnalyzer } from './run-opener.ts';
import type { CsvPart, RunAnalysis, RunWindow, RunWindowRequest } from '../../app/contract/run-window.ts';

export interface BenchService extends BenchApi, BenchHolder {
  /** Stops any run (safe state), closes the bench; for app exit. */
  close(): Promise<void>;
  /** The service always answers previewRun (./run-opener.ts). */
  previewRun(id: string, columns: number): Promise<RunPreview>;
  /** And holds a big drift log for its page (./run-opener.ts). */
  windowRun(id: string, request: RunWindowRequest): Promise<RunWindow>;
  analyzeRun(id: string): Promise<RunAnalysis>;
  runCsvPart(id: string, fromRow: number, rows: number): Promise<CsvPart>;
  /** A CSV import fed as UTF-8 slices (browser mode's streamed upload); absent when the store has none. */
  openImport?: (fileName: string, dutId: string) => ImportStream;
}

export interface BenchServiceOptions extends ServicePorts {
  /** What a bench reached over the API may be (./address-policy.ts); default: loopback, private LAN, serial devices. */
  addressPolicy?: AddressPolicy;
  /** Real ms the last-resort path waits for a run's own safe state before doing it itself. Default 8000. */
  lastResortWaitMs?: number;
  /** Real ms between live readouts while idle. Default 333. */
  livePeriodMs?: number;
  /** Real ms between sample batches during a run. Default 150. */
  batchMs?: number;
  /** Wall clock for the status strip's times (tests pin it). */
  now?: () => Date;
  /** Runs a big drift log's analysis; default in this thread (./run-opener.ts analyzeHere), a worker thread in serve and the desktop. */
  analyzeDrift?: DriftAnalyzer;
}

/** A service without campaigns (the web edition's page has no chamber): never running, no API methods. */
const NO_CAMPAIGNS: CampaignMethods = {
  api: {},
  running: () => false,
  stopAndWait: async () => {},
  stopWithin: async () => true,
};

const DISCONNECTED: ConnectionState = { connected: false, simulated: false, roles: [], error: null };

export function createBenchService(options: BenchServiceOptions): BenchService {
  const hub = new EventHub();
  const emit = (event: BenchEvent): void => hub.emit(event);
  let bench: OpenedBench | null = null;
  let connection: ConnectionState = DISCONNECTED;
  let live: LivePoller | null = null;
  let run: RunSession | null = null;
  let connecting = false;
  /** What the open bench was opened from, to fall back to when a new connection is refused. */
  let previousConfig: BenchConfig | 'sim' | null = null;
  /** A bring-up setting left the output on: closing must put the supply in the safe state. */
  let manualOutputOn = false;
  /** Between a start call's checks and its run being registered (two quick clicks must not start two runs). */
  let starting = false;

  const opener = createRunOpener((id) => options.store.open(id), options.analyzeDrift);
  const status = new BenchStatusTracker((state) => emit({ type: 'bench-status', status: state }), options.now);

  const setConnection = (state: ConnectionState): ConnectionState => {
    connection = state;
    status.connected(state);
    emit({ type: 'connection', state });
    return state;
  };

  const startLive = (): void => {
    if (!bench || run) return;
    live = new LivePoller({
      roles: bench.roles,
      clock: bench.clock,
      periodMs: options.livePeriodMs,
      emit: (readout) => emit({ type: 'live', readout }),
      onReading: (reading) => status.idle(reading),
    });
    live.start();
  };

  const stopLive = async (): Promise<void> => {
    const poller = live;
    live = null;
    await poller?.stop();
  };

  const endRunAndWait = async (): Promise<void> => {
    await campaigns.stopAndWait();
    const current = run;
    if (!current) return;
    current.control.stop('stop');
    await current.done;
  };

  const closeBench = async (): Promise<void> => {
    await endRunAndWait();
    await stopLive();
    if (bench && manualOutputOn) {
      const failures: string[] = [];
      let outputOff = false;
      const result = await goSafe(
        bench.roles,
        bench.roles.controlChannel,
        { controlV: 0, outputOff: true },
        (event) => {
          if (event.step === 'output-off' && event.ok === true) outputOff = true;
        },
      );
      failures.push(...result.failures);
      status.manualSafe({ ok: result.ok, failures, outputOff });
      manualOutputOn = false;
    }
    const closing = bench;
    bench = null;
    if (closing) await closing.close();
  };

  const requireIdleBench = (): OpenedBench => {
    if (!bench)
      throw new BenchApiError('no bench connected: connect to your instruments or to the simulated bench first');
    if (run) throw new BenchApiError(`a run is already in progress (${run.meta.id}); stop it before starting another`);
    if (campaigns.running())
      throw new BenchApiError(
        'a campaign holds the bench; stop it on the Campaign screen before starting anything else',
      );
    return bench;
  };

  const campaigns = (options.campaigns ?? (() => NO_CAMPAIGNS))({
    runsDir: options.runsDir,
    emit,
    batchMs: options.batchMs,
    acquire: async () => {
      const opened = requireIdleBench();
      if (starting || connecting)
        throw new BenchApiError('another run or connection is being started; try again in a moment');
      starting = true;
      await stopLive();
      manualOutputOn = false;
      return opened;
    },
    started: () => {
      starting = false;
    },
    release: () => {
      starting = false;
      startLive();
    },
  });

  const startRun = async (kind: RunKind, plan: unknown, dutId: string): Promise<RunMeta> => {
    const opened = requireIdleBench();
    if (starting || connecting)
      throw new BenchApiError('another run or connection is being started; try again in a moment');
    const procedure = options.procedures[kind];
    if (!procedure) throw new BenchApiError(`${kind} runs are not available in this build`);
    starting = true;
    await stopLive();
    try {
      const session = await startRunSession({
        runsDir: options.runsDir,
        kind,
        plan,
        dutId,
        bench: opened,
        procedure,
        emit,
        batchMs: options.batchMs,
        status,
      });
      run = session;
      // The procedure owns the supply now; its own safe state ends the run.
      manualOutputOn = false;
      void session.done.finally(() => {
        if (run === session) run = null;
        status.runEnded();
        startLive();
      });
      return session.meta;
    } catch (error) {
      startLive();
      throw error;
    } finally {
      starting = false;
    }
  };

  /**
   * The last-resort path (./last-resort-guard.ts): records why in the run,
   * stops it so the procedure drives its own safe state and records the end;
   * if the procedure does not end in time, drives the safe state here and
   * records the run as aborted. An idle bench's control channel goes to the
   * default safe state too. Never rejects.
   */
  const leaveSafe = async (cause: GuardCause): Promise<{ ok: boolean }> => {
    let ok = true;
    const current = run;
    const opened = bench;
    try {
      // A campaign drives its own safe state (supply off, chamber to safeC) once told to stop.
      if (campaigns.running()) ok = await campaigns.stopWithin(options.lastResortWaitMs ?? 8000);
      if (current) {
        const { kind: _kind, ...detail } = cause;
        current.note({ type: 'last-resort', cause: cause.kind, ...detail });
        current.control.stop(cause.kind === 'signal' ? 'signal' : cause.kind);
        const ended = await Promise.race([
          current.done.then(() => true),
          new Promise<boolean>((resolve) => {
            const timer: unknown = setTimeout(() => resolve(false), options.lastResortWaitMs ?? 8000);
            // Node: do not hold the process open for it; a page's timer is a number (nothing to unref).
            (timer as { unref?: () => void }).unref?.();
          }),
        ]);
        if (!ended && opened) {
          const result = await goSafe(opened.roles, opened.roles.controlChannel, current.safe, (event) =>
            current.note(event),
          );
          ok = result.ok;
          await current.abandon().catch(() => undefined);
        }
      } else if (opened) {
        ok = (
          await goSafe(opened.roles, opened.roles.controlChannel, { controlV: 0, outputOff: true }, () => undefined)
        ).ok;
      }
    } catch {
      ok = false;
    }
    await stopLive().catch(() => undefined);
    return { ok };
  };

  const requireRun = (): RunSession => {
    if (!run) throw new BenchApiError('no run in progress');
    return run;
  };

  return {
    listSerialPorts: () => options.listSerialPorts(),
    listProfiles: () => options.listProfiles(),
    async connect(config: BenchConfig | 'sim') {
      if (connecting || starting) throw new BenchApiError('a connection attempt or a run start is already in progress');
      if (campaigns.running())
        throw new BenchApiError('a campaign holds the bench; stop it on the Campaign screen before changing the bench');
      if (run) throw new BenchApiError(`a run is in progress (${run.meta.id}); stop it before changing the bench`);
      await checkApiBench(config, options.addressPolicy ?? { extraHosts: new Set() });
      connecting = true;
      try {
        const previous = bench ? previousConfig : null;
        await closeBench();
        try {
          bench = await options.openBench(config);
          previousConfig = config;
        } catch (error) {
          // What a peer or a file said is shown only as a short, escaped excerpt.
          const message = sanitiseText(error instanceof Error ? error.message : String(error), 200);
          // A refused connection must not also cost the bench that worked: open it again.
          if (previous !== null) {
            try {
              bench = await options.openBench(previous);
              setConnection(bench.connection);
              startLive();
              throw new BenchApiError(
                `could not connect to these instruments: ${message}. The previous bench is connected again.`,
              );
            } catch (reopenError) {
              if (reopenError instanceof BenchApiError) throw reopenError;
              bench = null;
            }
          }
          setConnection({ ...DISCONNECTED, error: `could not connect to these instruments: ${message}` });
          throw new BenchApiError(`could not connect to these instruments: ${message}`);
        }
        // An identity is whatever the peer answered: keep it short and printable.
        bench.connection = {
          ...bench.connection,
          roles: bench.connection.roles.map((role) => ({ ...role, idn: sanitiseText(role.idn, 100) })),
        };
        setConnection(bench.connection);
        startLive();
        return connection;
      } finally {
        connecting = false;
      }
    },
    async disconnect() {
      await closeBench();
      return setConnection(DISCONNECTED);
    },
    getConnection: async () => connection,
    getBenchStatus: async () => status.status,
    async manualControl(request) {
      const opened = requireIdleBench();
      if (starting || connecting)
        throw new BenchApiError('a run or a connection is being started; try again in a moment');
      starting = true;
      await stopLive();
      // Until read back, assume the output may be on: a failure half-way must still end in the safe state.
      if (request.output) manualOutputOn = true;
      try {
        const result = await applyManualControl(opened.roles, request);
        manualOutputOn = result.output;
        status.manual(result);
        return status.status;
      } finally {
        starting = false;
        startLive();
      }
    },
    startSweep: (plan, dutId) => startRun('sweep', plan, dutId),
    startDrift: (plan, dutId) => startRun('drift', plan, dutId),
    startPushing: (plan, dutId) => startRun('pushing', plan, dutId),
    async pauseRun() {
      requireRun().control.pause();
    },
    async resumeRun() {
      requireRun().control.resume();
    },
    async stopRun() {
      // Answers as soon as the run has been told: it leaves its waits at once and drives the safe
      // state, which can take a while on a busy bench; `run-ended` follows with the safe-state steps.
      requireRun().control.stop('stop');
    },
    listRuns: () => options.store.list(),
    previewRun: (id, columns) => opener.preview(id, columns),
    openRun: (id) => opener.open(id),
    windowRun: (id, request) => opener.window(id, request),
    analyzeRun: (id) => opener.analysis(id),
    runCsvPart: (id, fromRow, rows) => opener.csvPart(id, fromRow, rows),
    renameRun: (id, dutId) => {
      opener.forget(id);
      return options.store.rename(id, dutId);
    },
    addNote: (id, text) => {
      opener.forget(id);
      return options.store.addNote(id, text);
    },
    async deleteRun(id) {
      if (run?.meta.id === id) throw new BenchApiError(`run ${id} is in progress; stop it before deleting it`, 'id');
      opener.forget(id);
      await options.store.delete(id);
    },
    restoreRun: (id) => options.store.restore(id),
    importCsv: (fileName, csvText, dutId) => options.store.importCsv(fileName, csvText, dutId),
    ...campaigns.api,
    subscribe: (listener) => hub.subscribe(listener),
    ...(options.store.openImport ? { openImport: options.store.openImport.bind(options.store) } : {}),
    leaveSafe,
    async close() {
      await closeBench();
      connection = DISCONNECTED;
    },
  };
}
