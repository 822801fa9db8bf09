/**
 * Progress on stderr: on a terminal, one line redrawn in place with a bar
 * and the ETA; otherwise plain lines, at most one every few seconds so a log
 * file stays readable.
 */
import { formatClockDuration } from '../../app/analysis/format-clock.ts';
import type { ProgressInfo } from '../../app/contract/bench-api.ts';

export interface ProgressOutput {
  write(text: string): unknown;
  isTTY?: boolean;
}

function formatHz(hz: number | null): string {
  if (hz === null) return '—';
  const abs = Math.abs(hz);
  if (abs >= 1e6) return `${(hz / 1e6).toFixed(6)} MHz`;
  if (abs >= 1e3) return `${(hz / 1e3).toFixed(4)} kHz`;
  return `${hz.toFixed(2)} Hz`;
}

/** What a run counts: a sweep visits points, a drift log takes readings, pushing steps the DUT supply. */
const COUNTED: Readonly<Record<ProgressInfo['kind'], string>> = {
  sweep: 'points',
  drift: 'readings',
  pushing: 'supply steps',
};

export function describeProgress(p: ProgressInfo): string {
  let latest = '';
  if (p.latest !== null) {
    const reading = p.latest.status === 'ok' ? formatHz(p.latest.frequencyHz) : p.latest.status;
    // Pushing holds the control voltage; what moves is the DUT supply.
    latest =
      p.latest.supplyV !== undefined
        ? `  supply ${p.latest.supplyV.toFixed(4)} V → ${reading}`
        : `  ${p.latest.controlV.toFixed(4)} V → ${reading}`;
  }
  return `${p.phase} ${p.pointsDone}/${p.pointsTotal} ${COUNTED[p.kind] ?? 'points'}  ETA ${formatClockDuration(p.etaS)}${latest}`;
}

export function createProgressDisplay(
  out: ProgressOutput,
  nowMs: () => number = Date.now,
  plainEveryMs = 5000,
): { update: (p: ProgressInfo) => void; done: () => void } {
  const tty = out.isTTY === true;
  let lastPlainMs = -Infinity;
  let drawn = false;
  return {
    update(p) {
      if (tty) {
        const width = 24;
        const fraction = p.pointsTotal > 0 ? Math.min(1, p.pointsDone / p.pointsTotal) : 0;
        const filled = Math.round(fraction * width);
        out.write(`\r\x1b[2K[${'#'.repeat(filled)}${'.'.repeat(width - filled)}] ${describeProgress(p)}`);
        drawn = true;
        return;
      }
      const now = nowMs();
      if (now - lastPlainMs < plainEveryMs && p.pointsDone < p.pointsTotal) return;
      lastPlainMs = now;
      out.write(`${describeProgress(p)}\n`);
    },
    done() {
      if (tty && drawn) out.write('\n');
    },
  };
}
