/**
 * The bench status the strip on every screen shows, kept by main. During a
 * run it is fed only by what the run itself records (its sample rows and its
 * events: output on, pause, link lost, each safe-state step, end), so showing
 * it costs the instruments nothing. While idle the live poll feeds it,
 * including the output state and which instrument failed to answer.
 */
import type { BenchStatus, ConnectionState, RoleLinkStatus, RunEvent } from '../../app/contract/bench-api.ts';

type Role = RoleLinkStatus['role'];

/** One idle poll: the figures, the control output state, and each role whose read failed for want of a link. */
export interface IdleReading {
  controlSetV: number | null;
  controlMeasV: number | null;
  frequencyHz: number | null;
  temperatureC: number | null;
  output: boolean | null;
  /** Roles whose link failed in this poll, with the error; roles not named answered. */
  lost: Partial<Record<Role, string>>;
}

const EMPTY: BenchStatus = {
  source: 'none',
  output: null,
  controlSetV: null,
  controlMeasV: null,
  frequencyHz: null,
  temperatureC: null,
  updatedAt: null,
  links: [],
  paused: null,
  safeState: null,
};

const finiteOrNull = (value: unknown): number | null =>
  typeof value === 'number' && Number.isFinite(value) ? value : null;

export class BenchStatusTracker {
  #status: BenchStatus = EMPTY;
  #run: { id: string; steps: number; failures: string[]; outputOff: boolean } | null = null;
  readonly #emit: (status: BenchStatus) => void;
  readonly #now: () => Date;

  constructor(emit: (status: BenchStatus) => void, now: () => Date = () => new Date()) {
    this.#emit = emit;
    this.#now = now;
  }

  get status(): BenchStatus {
    return this.#status;
  }

  #set(patch: Partial<BenchStatus>): void {
    this.#status = { ...this.#status, ...patch };
    this.#emit(this.#status);
  }

  #link(role: string, state: 'up' | 'lost', detail: string | null): RoleLinkStatus[] {
    return this.#status.links.map((link) => (link.role === role ? { ...link, state, detail } : link));
  }

  /** A new connection (or none): every connected role starts up, figures unknown. */
  connected(connection: ConnectionState): void {
    this.#run = null;
    this.#status = {
      ...EMPTY,
      // How the last run left the supply stays worth knowing after a disconnect.
      safeState: this.#status.safeState,
      source: connection.connected ? 'idle' : 'none',
      links: connection.roles.map((role) => ({ role: role.role, state: 'up', detail: null })),
    };
    this.#emit(this.#status);
  }

  idle(reading: IdleReading): void {
    if (this.#run) return;
    const links = this.#status.links.map((link): RoleLinkStatus => {
      const lost = reading.lost[link.role];
      return lost === undefined ? { ...link, state: 'up', detail: null } : { ...link, state: 'lost', detail: lost };
    });
    const { lost: _lost, ...figures } = reading;
    this.#set({ ...figures, source: 'idle', links, updatedAt: this.#now().toISOString() });
  }

  runStarted(runId: string): void {
    this.#run = { id: runId, steps: 0, failures: [], outputOff: false };
    // Figures from before the run say nothing about it; the run's rows fill them in.
    this.#set({
      source: 'run',
      paused: null,
      frequencyHz: null,
      controlMeasV: null,
      updatedAt: this.#now().toISOString(),
    });
  }

  /** The newest row of a batch the run recorded. */
  runRow(row: Readonly<Record<string, number | string>>): void {
    if (!this.#run) return;
    const ok = row.status === undefined || row.status === 'ok';
    const patch: Partial<BenchStatus> = { updatedAt: this.#now().toISOString() };
    const controlV = finiteOrNull(row.control_v);
    if (controlV !== null) patch.controlSetV = controlV;
    if ('control_meas_v' in row) patch.controlMeasV = finiteOrNull(row.control_meas_v);
    // A no-signal reading is a fact too: the oscillator is not running at this voltage.
    patch.frequencyHz = ok ? finiteOrNull(row.frequency_hz) : null;
    const temperature = finiteOrNull(row.temperature_c);
    if (temperature !== null) patch.temperatureC = temperature;
    this.#set(patch);
  }

  runEvent(event: RunEvent): void {
    const run = this.#run;
    if (!run) return;
    const at = this.#now().toISOString();
    switch (event.type) {
      case 'output-on':
        this.#set({ output: true, controlSetV: finiteOrNull(event.controlV) ?? this.#status.controlSetV });
        break;
      case 'pause':
      case 'paused':
        this.#set({ paused: { since: at, controlV: this.#status.controlSetV } });
        break;
      case 'resume':
        this.#set({ paused: null });
        break;
      case 'link-lost':
      case 'reconnect-failed':
        this.#set({
          links: this.#link(String(event.role), 'lost', typeof event.error === 'string' ? event.error : null),
        });
        break;
      case 'reconnected':
        this.#set({ links: this.#link(String(event.role), 'up', null) });
        break;
      case 'safe-state': {
        run.steps += 1;
        const step = typeof event.step === 'string' ? event.step : 'step';
        if (event.ok !== true)
          run.failures.push(`${step}: ${typeof event.error === 'string' ? event.error : 'failed'}`);
        const patch: Partial<BenchStatus> = { paused: null };
        const volts = /^control-voltage (\S+) V$/.exec(step);
        if (event.ok === true && volts) patch.controlSetV = finiteOrNull(Number(volts[1]));
        if (event.ok === true && step === 'output-off') {
          run.outputOff = true;
          patch.output = false;
        }
        this.#set(patch);
        break;
      }
      case 'end':
        this.#set({
          paused: null,
          safeState: {
            runId: run.id,
            reached: run.steps > 0 && run.failures.length === 0,
            at,
            outputOff: run.outputOff,
            failures: run.failures,
          },
        });
        break;
      default:
        break;
    }
  }

  /** A bring-up setting the supply confirmed by read-back. */
  manual(setting: { controlSetV: number; output: boolean }): void {
    if (this.#run) return;
    this.#set({ ...setting, source: 'idle', updatedAt: this.#now().toISOString() });
  }

  /** The safe state applied outside a run (a bring-up output left on at disconnect). */
  manualSafe(result: { ok: boolean; failures: string[]; outputOff: boolean }): void {
    this.#set({
      ...(result.outputOff ? { output: false } : {}),
      safeState: {
        runId: 'manual',
        reached: result.ok,
        at: this.#now().toISOString(),
        outputOff: result.outputOff,
        failures: result.failures,
      },
    });
  }

  /** The run is over (recorded); the idle poll takes over. */
  runEnded(): void {
    const run = this.#run;
    this.#run = null;
    const unrecorded = run && this.#status.safeState?.runId !== run.id;
    this.#set({
      source: 'idle',
      paused: null,
      // A run that never reached its end event leaves the supply in a state nobody confirmed.
      ...(run && unrecorded
        ? {
            safeState: {
              runId: run.id,
              reached: false,
              at: this.#now().toISOString(),
              outputOff: run.outputOff,
              failures: [...run.failures, 'the run recorded no end of its safe state'],
            },
          }
        : {}),
    });
  }
}
