/**
 * The gain table: one row per figure a designer looks for, min / typ / max
 * over the selected runs, each with its conditions and unit. Values stay in
 * SI base units here; the renderers scale them.
 */
import type { AnyAnalysis } from './analyze-table.ts';
import { formatSi } from './format-si.ts';

export interface RunConditions {
  temperatureC: number | null;
  supplyV: number | null;
  gateS: number | null;
}

export interface DatasheetRun {
  /** Run id and DUT id, as shown to the reader. */
  label: string;
  analysis: AnyAnalysis;
  conditions: RunConditions;
  /** Where the run came from (run folders; absent for a plain CSV). */
  origin?: RunOrigin;
}

/** What run.json says about a run that decides whether it may enter the table. */
export interface RunOrigin {
  status: string;
  dutId: string;
  /** DUT kind when run.json names one. */
  dutKind: string | null;
  /** The run was taken on the simulated bench. */
  simulated: boolean;
}

export interface DatasheetOptions {
  /** Keep aborted, interrupted and failed runs (default: left out, named in the notes). */
  includeIncomplete?: boolean;
  /** Allow runs of different DUTs (id stem, kind, or tuning ranges that do not overlap) in one table. */
  allowMixed?: boolean;
}

export interface DatasheetRow {
  key: string;
  parameter: string;
  conditions: string;
  /** Only typ is set when one run contributes. */
  min: number | null;
  typ: number | null;
  max: number | null;
  /** SI unit; 'si' rows take prefixes (kHz/V), 'plain' rows do not (ppm/°C, %). */
  unit: string;
  scaling: 'si' | 'plain';
  runs: number;
  /** 1σ of the figure: the one run's, or the largest among the runs (null when the analysis gives none). */
  uncertainty: number | null;
  /** False when the figure is within 2σ of zero in every contributing run (drift, tempco, pushing). */
  significant: boolean;
}

export interface Datasheet {
  title: string;
  runs: { label: string; kind: string; simulated: boolean }[];
  /** Some or all runs came from the simulated bench (every export says so). */
  simulated: boolean;
  rows: DatasheetRow[];
  notes: string[];
}

interface RowSpec {
  key: string;
  parameter: string;
  unit: string;
  scaling: 'si' | 'plain';
  kinds: AnyAnalysis['kind'][];
  value(a: AnyAnalysis): number | null;
  extra?(a: AnyAnalysis): string | null;
  sd?(a: AnyAnalysis): number | null;
  significant?(a: AnyAnalysis): boolean;
}

const windowText = (a: AnyAnalysis): string | null =>
  a.kind === 'sweep'
    ? `window ${formatSi(a.window.fromV, 'V')} … ${formatSi(a.window.toV, 'V')}${a.window.source === 'auto' ? ' (usable range)' : ''}`
    : null;

const finite = (v: number | null | undefined): number | null =>
  v === null || v === undefined || !Number.isFinite(v) ? null : v;

const ROWS: RowSpec[] = [
  {
    key: 'fMin',
    parameter: 'Tuning range, low end',
    unit: 'Hz',
    scaling: 'si',
    kinds: ['sweep'],
    value: (a) => (a.kind === 'sweep' ? a.tuningRange.fMinHz : null),
    sd: (a) => (a.kind === 'sweep' ? a.tuningRange.fMinUncertaintyHz : null),
    extra: (a) => (a.kind === 'sweep' ? `at ${formatSi(a.tuningRange.vAtFMin, 'V')}` : null),
  },
  {
    key: 'fMax',
    parameter: 'Tuning range, high end',
    unit: 'Hz',
    scaling: 'si',
    kinds: ['sweep'],
    value: (a) => (a.kind === 'sweep' ? a.tuningRange.fMaxHz : null),
    sd: (a) => (a.kind === 'sweep' ? a.tuningRange.fMaxUncertaintyHz : null),
    extra: (a) => (a.kind === 'sweep' ? `at ${formatSi(a.tuningRange.vAtFMax, 'V')}` : null),
  },
  {
    key: 'kvcoNominal',
    parameter: 'Kvco at the nominal point',
    unit: 'Hz/V',
    scaling: 'si',
    kinds: ['sweep'],
    value: (a) => (a.kind === 'sweep' ? a.kvco.nominal.hzPerV : null),
    sd: (a) => (a.kind === 'sweep' ? a.kvco.nominal.uncertaintyHzPerV : null),
    extra: (a) => (a.kind === 'sweep' ? `at ${formatSi(a.kvco.nominal.v, 'V')}` : null),
  },
  {
    key: 'kvcoLow',
    parameter: 'Kvco, lowest over the tuning window',
    unit: 'Hz/V',
    scaling: 'si',
    kinds: ['sweep'],
    value: (a) => (a.kind === 'sweep' ? a.kvco.minHzPerV : null),
    sd: (a) => (a.kind === 'sweep' ? a.kvco.minUncertaintyHzPerV : null),
    extra: windowText,
  },
  {
    key: 'kvcoHigh',
    parameter: 'Kvco, highest over the tuning window',
    unit: 'Hz/V',
    scaling: 'si',
    kinds: ['sweep'],
    value: (a) => (a.kind === 'sweep' ? a.kvco.maxHzPerV : null),
    sd: (a) => (a.kind === 'sweep' ? a.kvco.maxUncertaintyHzPerV : null),
    extra: windowText,
  },
  {
    key: 'kvcoLine',
    parameter: 'Kvco, best straight line',
    unit: 'Hz/V',
    scaling: 'si',
    kinds: ['sweep'],
    value: (a) => (a.kind === 'sweep' ? a.kvco.linear.slopeHzPerV : null),
    sd: (a) => (a.kind === 'sweep' ? a.kvco.linear.slopeUncertaintyHzPerV : null),
    extra: windowText,
  },
  {
    key: 'linearity',
    parameter: 'Linearity error (worst, of span)',
    unit: '%',
    scaling: 'plain',
    kinds: ['sweep'],
    value: (a) => (a.kind === 'sweep' ? a.kvco.linear.maxLinearityErrorPct : null),
    extra: (a) =>
      a.kind === 'sweep' ? `${formatSi(a.kvco.linear.fromV, 'V')} … ${formatSi(a.kvco.linear.toV, 'V')}` : null,
  },
  {
    key: 'stall',
    parameter: 'Stall threshold (oscillation starts)',
    unit: 'V',
    scaling: 'si',
    kinds: ['sweep'],
    value: (a) => (a.kind === 'sweep' ? a.stall.thresholdV : null),
    sd: (a) => (a.kind === 'sweep' ? a.stall.thresholdUncertaintyV : null),
  },
  {
    key: 'unstable',
    parameter: 'Unstable below',
    unit: 'V',
    scaling: 'si',
    kinds: ['sweep'],
    value: (a) => (a.kind === 'sweep' ? a.stall.unstableBelowV : null),
    sd: (a) => (a.kind === 'sweep' ? a.stall.unstableBelowUncertaintyV : null),
  },
  {
    key: 'saturation',
    parameter: 'Curve flattens above',
    unit: 'V',
    scaling: 'si',
    kinds: ['sweep'],
    value: (a) => (a.kind === 'sweep' ? (a.kvco.saturation?.edgeV ?? null) : null),
    sd: (a) => (a.kind === 'sweep' ? (a.kvco.saturation?.uncertaintyV ?? null) : null),
  },
  {
    key: 'tempco',
    parameter: 'Temperature coefficient',
    unit: 'ppm/°C',
    scaling: 'plain',
    kinds: ['drift'],
    value: (a) => (a.kind === 'drift' ? a.tempcoPpmPerC : null),
    sd: (a) => (a.kind === 'drift' ? a.tempcoUncertaintyPpmPerC : null),
    significant: (a) => a.kind === 'drift' && a.tempcoSignificant,
  },
  {
    key: 'warmup',
    parameter: 'Warm-up time',
    unit: 'min',
    scaling: 'plain',
    kinds: ['drift'],
    value: (a) => (a.kind === 'drift' && a.warmUp.warmUpS !== null ? a.warmUp.warmUpS / 60 : null),
    extra: (a) => (a.kind === 'drift' ? `drift within ${a.warmUp.limitPpmPerHour} ppm/h` : null),
  },
  {
    key: 'drift',
    parameter: 'Drift after warm-up',
    unit: 'ppm/h',
    scaling: 'plain',
    kinds: ['drift'],
    value: (a) => (a.kind === 'drift' ? a.driftPpmPerHour : null),
    sd: (a) => (a.kind === 'drift' ? a.driftUncertaintyPpmPerHour : null),
    significant: (a) => a.kind === 'drift' && a.driftSignificant,
    extra: (a) => (a.kind === 'drift' ? `over ${formatSi(a.durationS, 's', 3)}` : null),
  },
  {
    key: 'adev1s',
    parameter: 'Allan deviation (overlapping), τ = 1 s',
    unit: '',
    scaling: 'plain',
    kinds: ['drift'],
    value: (a) => (a.kind === 'drift' ? (a.adev.find((p) => Math.abs(p.tauS - 1) < 1e-9)?.adev ?? null) : null),
    extra: (a) =>
      a.kind === 'drift' && a.adev.find((p) => Math.abs(p.tauS - 1) < 1e-9)?.resolutionLimited
        ? 'resolution-limited (±1 count)'
        : null,
  },
  {
    key: 'pushing',
    parameter: 'Supply pushing',
    unit: 'Hz/V',
    scaling: 'si',
    kinds: ['pushing'],
    value: (a) => (a.kind === 'pushing' ? a.pushingHzPerV : null),
    sd: (a) => (a.kind === 'pushing' ? a.pushingUncertaintyHzPerV : null),
    significant: (a) => a.kind === 'pushing' && a.pushingSignificant,
    extra: (a) => (a.kind === 'pushing' ? `at ${formatSi(a.nominalSupplyV, 'V')} supply` : null),
  },
  {
    key: 'pushingPpm',
    parameter: 'Supply pushing, relative',
    unit: 'ppm/V',
    scaling: 'plain',
    kinds: ['pushing'],
    value: (a) => (a.kind === 'pushing' ? a.pushingPpmPerV : null),
    sd: (a) =>
      a.kind === 'pushing' && a.pushingHzPerV !== 0
        ? Math.abs((a.pushingUncertaintyHzPerV / a.pushingHzPerV) * a.pushingPpmPerV)
        : null,
    significant: (a) => a.kind === 'pushing' && a.pushingSignificant,
  },
];

function median(sorted: number[]): number {
  const n = sorted.length;
  return n % 2 ? (sorted[(n - 1) >> 1] as number) : ((sorted[n / 2 - 1] as number) + (sorted[n / 2] as number)) / 2;
}

function span(values: number[], unit: string, scaling: 'si' | 'plain'): string {
  const lo = Math.min(...values);
  const hi = Math.max(...values);
  if (scaling === 'plain')
    return lo === hi ? `${lo.toFixed(1)} ${unit}` : `${lo.toFixed(1)} … ${hi.toFixed(1)} ${unit}`;
  return lo === hi ? formatSi(lo, unit, 3) : `${formatSi(lo, unit, 3)} … ${formatSi(hi, unit, 3)}`;
}

function conditionsOf(runs: DatasheetRun[], extras: string[]): string {
  const parts: string[] = [];
  const temps = runs.map((r) => r.conditions.temperatureC).filter((v): v is number => v !== null);
  const supplies = runs.map((r) => r.conditions.supplyV).filter((v): v is number => v !== null);
  const gates = runs.map((r) => r.conditions.gateS).filter((v): v is number => v !== null);
  if (temps.length) parts.push(`T ${span(temps, '°C', 'plain')}`);
  if (supplies.length) parts.push(`supply ${span(supplies, 'V', 'si')}`);
  if (gates.length) parts.push(`gate ${span(gates, 's', 'si')}`);
  const uniqueExtras = [...new Set(extras)];
  if (uniqueExtras.length === 1) parts.push(uniqueExtras[0] as string);
  else if (uniqueExtras.length > 1) parts.push(`${uniqueExtras.length} operating points`);
  return parts.join('; ');
}

const INCOMPLETE = new Set(['aborted', 'interrupted', 'failed', 'running']);

/** "lo-7" and "lo_12" share the stem "lo": unit numbers of one design. */
export function dutStem(id: string): string {
  return id
    .trim()
    .toLowerCase()
    .replace(/[-_ .#]*(unit)?[-_ .#]*\d+$/, '');
}

/** Refusal of a table over runs that do not belong together. */
export class DatasheetInputError extends Error {
  override name = 'DatasheetInputError';
}

/** Reasons the runs are not one design (empty when they are). */
function mixedReasons(runs: DatasheetRun[]): string[] {
  const reasons: string[] = [];
  const withOrigin = runs.filter((r) => r.origin);
  const stems = [...new Set(withOrigin.map((r) => dutStem(r.origin?.dutId ?? '')))];
  if (stems.length > 1)
    reasons.push(`different DUT ids (${[...new Set(withOrigin.map((r) => r.origin?.dutId))].join(', ')})`);
  const kinds = [...new Set(withOrigin.map((r) => r.origin?.dutKind).filter((k): k is string => !!k))];
  if (kinds.length > 1) reasons.push(`different DUT kinds (${kinds.join(', ')})`);
  const sweeps = runs.filter((r) => r.analysis.kind === 'sweep');
  for (let i = 0; i < sweeps.length; i++) {
    for (let j = i + 1; j < sweeps.length; j++) {
      const a = sweeps[i] as DatasheetRun;
      const b = sweeps[j] as DatasheetRun;
      if (a.analysis.kind !== 'sweep' || b.analysis.kind !== 'sweep') continue;
      const ta = a.analysis.tuningRange;
      const tb = b.analysis.tuningRange;
      if (ta.fMaxHz < tb.fMinHz || tb.fMaxHz < ta.fMinHz) {
        reasons.push(
          `tuning ranges that do not overlap (${a.label}: ${formatSi(ta.fMinHz, 'Hz')} … ${formatSi(ta.fMaxHz, 'Hz')}; ${b.label}: ${formatSi(tb.fMinHz, 'Hz')} … ${formatSi(tb.fMaxHz, 'Hz')})`,
        );
      }
    }
  }
  return reasons;
}

export function buildDatasheet(
  all: DatasheetRun[],
  title = 'VCO gain table',
  options: DatasheetOptions = {},
): Datasheet {
  const leftOut: string[] = [];
  const runs = all.filter((r) => {
    if (!r.origin || !INCOMPLETE.has(r.origin.status) || options.includeIncomplete) return true;
    leftOut.push(
      `${r.label} left out: the run is ${r.origin.status} (include it with --include-incomplete, or the table's "Include incomplete runs" toggle)`,
    );
    return false;
  });
  if (!options.allowMixed) {
    const reasons = mixedReasons(runs);
    if (reasons.length > 0) {
      throw new DatasheetInputError(
        `these runs are not one design: ${reasons.join('; ')}. Pick runs of one DUT, or allow a mixed table (--allow-mixed)`,
      );
    }
  }
  const rows: DatasheetRow[] = [];
  for (const spec of ROWS) {
    const contributing = runs.filter(
      (r) => spec.kinds.includes(r.analysis.kind) && finite(spec.value(r.analysis)) !== null,
    );
    if (contributing.length === 0) continue;
    const values = contributing.map((r) => spec.value(r.analysis) as number).sort((a, b) => a - b);
    const extras = spec.extra ? contributing.map((r) => spec.extra?.(r.analysis)).filter((s): s is string => !!s) : [];
    const sds = spec.sd
      ? contributing.map((r) => finite(spec.sd?.(r.analysis))).filter((v): v is number => v !== null)
      : [];
    const one = values.length === 1;
    rows.push({
      key: spec.key,
      parameter: spec.parameter,
      conditions: conditionsOf(contributing, extras),
      min: one ? null : (values[0] as number),
      typ: median(values),
      max: one ? null : (values[values.length - 1] as number),
      unit: spec.unit,
      scaling: spec.scaling,
      runs: values.length,
      uncertainty: sds.length ? Math.max(...sds) : null,
      significant: spec.significant ? contributing.some((r) => spec.significant?.(r.analysis)) : true,
    });
  }
  const simulated = all.some((r) => r.origin?.simulated);
  const notes = [
    ...(simulated
      ? [
          `SIMULATED: ${
            runs
              .filter((r) => r.origin?.simulated)
              .map((r) => r.label)
              .join(', ') || 'runs'
          } came from the simulated bench, not from hardware.`,
        ]
      : []),
    'typ is the median over the runs that give the figure; min and max are shown when two or more runs do; ± is 1σ (the largest among the runs).',
    "Kvco figures come from the derivative of the fitted tuning curve over the tuning window (the plan's or --window, else the usable range).",
    ...leftOut,
  ];
  for (const r of runs) {
    if ('warnings' in r.analysis) for (const w of r.analysis.warnings) notes.push(`${r.label}: ${w}`);
  }
  return {
    title,
    runs: runs.map((r) => ({ label: r.label, kind: r.analysis.kind, simulated: r.origin?.simulated ?? false })),
    simulated,
    rows,
    notes,
  };
}
