/** Words of the status strip, pure so they can be tested with real values. */
import type { RunKind } from '../contract/bench-api.ts';
import { duration } from './units.ts';

const KIND_LABEL: Record<RunKind, string> = { sweep: 'Gain sweep', drift: 'Drift log', pushing: 'Supply pushing' };

export function runKindLabel(kind: RunKind): string {
  return KIND_LABEL[kind];
}

/** Local wall-clock time of an ISO instant, "14:03:27"; the ISO text itself when unreadable. */
export function clockTime(iso: string): string {
  const date = new Date(iso);
  if (Number.isNaN(date.getTime())) return iso;
  return date.toLocaleTimeString(undefined, { hour: '2-digit', minute: '2-digit', second: '2-digit', hour12: false });
}

export interface StripRun {
  kind: RunKind;
  dut: string;
  done: number;
  total: number;
  /** Time on the run's own clock of its latest reading, s. */
  elapsedS: number | null;
}

/** "Drift log · osc-7 · 42 of 120 readings · running 1 min 05 s". */
export function stripRunText(run: StripRun): string {
  const unit = run.kind === 'drift' ? 'readings' : 'points';
  const elapsed = duration(run.elapsedS);
  const count = run.total > 0 ? `${run.done} of ${run.total} ${unit}` : `${run.done} ${unit}`;
  return `${KIND_LABEL[run.kind]} · ${run.dut} · ${count} · running ${elapsed}`;
}

/** What the run's safe state will do, read from its plan ("control to 0 V, then output off"). */
export function safeStateWords(plan: unknown): string {
  const safe = (plan && typeof plan === 'object' ? (plan as { safe?: unknown }).safe : undefined) as
    { controlV?: unknown; outputOff?: unknown } | undefined;
  const controlV = typeof safe?.controlV === 'number' && Number.isFinite(safe.controlV) ? safe.controlV : 0;
  const outputOff = safe?.outputOff !== false;
  const level = `${Number(controlV.toPrecision(6))} V`;
  return outputOff
    ? `the control voltage goes to ${level} (the safe level), then the supply output turns off`
    : `the control voltage goes to ${level} (the safe level); the plan keeps the output on`;
}

/** One instrument's link in the strip: "counter answers", or "counter link lost (tcp://10.0.0.7:5025)". */
export function linkText(role: string, state: 'up' | 'lost', address: string | null): string {
  if (state === 'up') return `${role} answers`;
  return address === null || address === 'sim' || address.startsWith('sim:')
    ? `${role} link lost`
    : `${role} link lost (${address})`;
}

/** The bench badge's words while some links are lost: "counter link lost" / "counter and supply links lost". */
export function lostLinksText(roles: readonly string[]): string | null {
  if (roles.length === 0) return null;
  if (roles.length === 1) return `${roles[0]} link lost`;
  return `${roles.slice(0, -1).join(', ')} and ${roles.at(-1)} links lost`;
}
