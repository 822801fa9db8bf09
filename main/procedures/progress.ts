/**
 * Progress reports with an ETA from the mean time per point so far — the
 * settling time varies along a sweep, so the running mean beats a guess
 * from the plan.
 */
import type { ProgressInfo, RunKind, SampleStatus } from '../../app/contract/bench-api.ts';
import type { Clock } from '../time/clock.ts';

export type ProgressListener = (progress: ProgressInfo) => void;

export class ProgressReporter {
  readonly #clock: Clock;
  readonly #listener: ProgressListener | undefined;
  readonly #runId: string;
  readonly #kind: RunKind;
  readonly #startS: number;
  total: number;

  constructor(clock: Clock, kind: RunKind, runId: string, total: number, listener?: ProgressListener) {
    this.#clock = clock;
    this.#kind = kind;
    this.#runId = runId;
    this.total = total;
    this.#listener = listener;
    this.#startS = clock.now();
  }

  report(
    phase: ProgressInfo['phase'],
    done: number,
    latest: { controlV: number; frequencyHz: number; status: SampleStatus } | null,
  ): void {
    if (!this.#listener) return;
    const elapsedS = this.#clock.now() - this.#startS;
    const etaS = done > 0 && this.total >= done ? (elapsedS / done) * (this.total - done) : null;
    this.#listener({
      runId: this.#runId,
      kind: this.#kind,
      phase,
      pointsDone: done,
      pointsTotal: this.total,
      etaS,
      latest: latest === null ? null : { controlV: latest.controlV, frequencyHz: Number.isNaN(latest.frequencyHz) ? null : latest.frequencyHz, status: latest.status },
    });
  }
}
