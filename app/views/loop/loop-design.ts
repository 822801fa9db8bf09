/**
 * The loop screen's design step, pure: the filter designed at the lock point
 * and checked at every usable Kvco corner. A failure names the input field it
 * concerns, so the screen can say it next to that field (and keep showing the
 * last good design) instead of letting the results disappear.
 */
import { loopAcrossKvco, type LoopCheck } from '../../analysis/loop-filter-eval.ts';
import { designLoopFilter, type LoopDesign } from '../../analysis/loop-filter.ts';
import type { KvcoCorner, OperatingPoint } from '../../analysis/loop-operating-point.ts';
import type { RunMeta } from '../../contract/bench-api.ts';
import type { LoopDraft, LoopValues } from './loop-inputs.ts';

export const CORNER_LABELS: Record<KvcoCorner['label'], string> = {
  min: 'Kvco min (window)',
  lock: 'Kvco at the lock point',
  max: 'Kvco max (window)',
};

export type CornerCheck = LoopCheck & { kvcoHzPerV: number; label: string };

export type DesignOutcome =
  { ok: true; design: LoopDesign; checks: CornerCheck[] } | { ok: false; error: string; field: keyof LoopDraft };

/** Which input a refusal of the designer is about (its messages name the spec key). */
function fieldOf(message: string): keyof LoopDraft {
  if (/phaseMargin|phase margin|pole ratio/i.test(message)) return 'phaseMarginDeg';
  if (/loopBandwidth|bandwidth/i.test(message)) return 'loopBandwidthHz';
  if (/chargePump/i.test(message)) return 'chargePumpA';
  if (/dividerN/i.test(message)) return 'dividerN';
  return 'referenceHz';
}

export function designAtLock(point: OperatingPoint, values: LoopValues): DesignOutcome {
  const lock = point.corners.find((c) => c.label === 'lock');
  // The lock point N·f_ref is set by the reference and the divider; its message says which range it missed.
  if (!lock || !lock.usable)
    return { ok: false, error: lock?.reason ?? 'no lock point on this sweep', field: 'referenceHz' };
  try {
    const design = designLoopFilter({ ...values, kvcoHzPerV: Math.abs(lock.kvcoHzPerV) });
    // Only corners with loop gain can be checked; the others stay in the table with their reason.
    const usable = point.corners.filter((c) => c.usable);
    const checks = loopAcrossKvco(
      design.filter,
      { dividerN: values.dividerN, chargePumpA: values.chargePumpA },
      usable.map((c) => Math.abs(c.kvcoHzPerV)),
    );
    return {
      ok: true,
      design,
      checks: checks.map((c, i) => ({ ...c, label: CORNER_LABELS[usable[i]?.label ?? 'lock'] })),
    };
  } catch (error) {
    const message = error instanceof Error ? error.message : String(error);
    return { ok: false, error: message, field: fieldOf(message) };
  }
}

/** A sweep one could design from: finished (or stopped) and not failed. */
export function sweepCandidates(runs: readonly RunMeta[]): RunMeta[] {
  return runs.filter((r) => r.kind === 'sweep' && r.status !== 'running' && r.status !== 'failed');
}

/**
 * Sweeps offered: candidates less those found, once opened, to hold no reading with a frequency (a sweep
 * stopped before its first point, or one that never saw the oscillator run): no Kvco can come from them.
 */
export function offeredSweeps(runs: readonly RunMeta[], noPoints: ReadonlySet<string>): RunMeta[] {
  return sweepCandidates(runs).filter((r) => !noPoints.has(r.id));
}

/** Readings that carry a frequency: status ok and a finite, positive value. */
export function frequencyPoints(frequencyHz: ArrayLike<number>, statusCodes: ArrayLike<number>, rows: number): number {
  let count = 0;
  for (let i = 0; i < rows; i++) {
    const f = frequencyHz[i] ?? Number.NaN;
    if ((statusCodes[i] ?? 0) === 0 && Number.isFinite(f) && f > 0) count++;
  }
  return count;
}
