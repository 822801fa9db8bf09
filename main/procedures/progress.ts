/**
 * Progress reports with an ETA from the mean time per point so far — the
 * settling time varies along a sweep, so the running mean beats a guess
 * from the plan. One-off work that is not a point (the settling probe, the
 * drift log's first settle) is left out of that mean, so it does not inflate
 * the ETA of the points after it, and so is the first point (it starts at
 * switch-on, unlike the rest).
 *
 * The total is what is planned now: refinement points are added when the
 * refinement starts and the total is cut back to the points actually done
 * when a run completes (a bisection may stop early), so a finished run
 * always reads "n of n" with an ETA of 0.
 */
import type { ProgressInfo, RunKind, SampleStatus } from '../../app/contract/bench-api.ts';
import type { Clock } from '../time/clock.ts';

export type ProgressListener = (progress: ProgressInfo) => void;

type Latest = { controlV: number; frequencyHz: number; status: SampleStatus; supplyV?: number } | null;

export class ProgressReporter {
  readonly #clock: Clock;
  readonly #listener: ProgressListener | undefined;
  readonly #runId: string;
  readonly #kind: RunKind;
  readonly #startS: number;
  #excludedS = 0;
  /** Points whose whole time was left out (one-off work such as the step back from the τ probe). */
  #excludedPoints = 0;
  #done = 0;
  /** Clock time and count of the first report with a point done; the rate is measured from there on. */
  #baseline: { atS: number; done: number; excludedS: number; excludedPoints: number } | null = null;
  total: number;

  constructor(clock: Clock, kind: RunKind, runId: string, total: number, listener?: ProgressListener) {
    this.#clock = clock;
    this.#kind = kind;
    this.#runId = runId;
    this.total = total;
    this.#listener = listener;
    this.#startS = clock.now();
  }

  /** Points done so far (the last count reported). */
  get done(): number {
    return this.#done;
  }

  /** Leaves `seconds` of one-off work out of the time per point. */
  exclude(seconds: number): void {
    if (seconds > 0) this.#excludedS += seconds;
  }

  /** Time one point's `work` and leave the point out of the time per point altogether. */
  async excludingPoint<T>(work: () => Promise<T>): Promise<T> {
    this.#excludedPoints++;
    return this.excluding(work);
  }

  /** Time `work` and leave it out of the time per point. */
  async excluding<T>(work: () => Promise<T>): Promise<T> {
    const t0 = this.#clock.now();
    try {
      return await work();
    } finally {
      this.exclude(this.#clock.now() - t0);
    }
  }

  report(phase: ProgressInfo['phase'], done: number, latest: Latest): void {
    this.#done = done;
    const nowS = this.#clock.now();
    if (this.#baseline === null && done > 0)
      this.#baseline = { atS: nowS, done, excludedS: this.#excludedS, excludedPoints: this.#excludedPoints };
    if (!this.#listener) return;
    const perPointS = this.#perPointS(nowS, done);
    const etaS = done > 0 && this.total >= done && Number.isFinite(perPointS) ? perPointS * (this.total - done) : null;
    this.#listener({
      runId: this.#runId,
      kind: this.#kind,
      phase,
      pointsDone: done,
      pointsTotal: this.total,
      etaS,
      latest:
        latest === null
          ? null
          : {
              controlV: latest.controlV,
              frequencyHz: Number.isNaN(latest.frequencyHz) ? null : latest.frequencyHz,
              status: latest.status,
              ...(latest.supplyV === undefined ? {} : { supplyV: latest.supplyV }),
            },
    });
  }

  /**
   * Mean time per point. The first point starts at switch-on (no step, or
   * one through the stall edge), so once a later point is done the rate is
   * measured from the end of the first.
   */
  #perPointS(nowS: number, done: number): number {
    const base = this.#baseline;
    if (base !== null && done > base.done) {
      const counted = done - base.done - (this.#excludedPoints - base.excludedPoints);
      // Nothing but left-out points since the first: no rate measured yet.
      return counted > 0 ? Math.max(0, nowS - base.atS - (this.#excludedS - base.excludedS)) / counted : Number.NaN;
    }
    return done > 0 ? Math.max(0, nowS - this.#startS - this.#excludedS) / done : Number.NaN;
  }

  /**
   * The last report of a run. A completed run did everything it was going
   * to: the total becomes the points done (ETA 0). A run that ended early
   * keeps its planned total, so "12 of 40" says how far it got.
   */
  finish(completed: boolean): void {
    if (completed) this.total = this.#done;
    this.report('finishing', this.#done, null);
  }
}
