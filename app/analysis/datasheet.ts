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
}

export interface Datasheet {
  title: string;
  runs: { label: string; kind: string }[];
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
}

const finite = (v: number | null | undefined): number | null => (v === null || v === undefined || !Number.isFinite(v) ? null : v);

const ROWS: RowSpec[] = [
  { key: 'fMin', parameter: 'Tuning range, low end', unit: 'Hz', scaling: 'si', kinds: ['sweep'], value: (a) => (a.kind === 'sweep' ? a.tuningRange.fMinHz : null), extra: (a) => (a.kind === 'sweep' ? `at ${formatSi(a.tuningRange.vAtFMin, 'V')}` : null) },
  { key: 'fMax', parameter: 'Tuning range, high end', unit: 'Hz', scaling: 'si', kinds: ['sweep'], value: (a) => (a.kind === 'sweep' ? a.tuningRange.fMaxHz : null), extra: (a) => (a.kind === 'sweep' ? `at ${formatSi(a.tuningRange.vAtFMax, 'V')}` : null) },
  { key: 'kvcoNominal', parameter: 'Kvco at the nominal point', unit: 'Hz/V', scaling: 'si', kinds: ['sweep'], value: (a) => (a.kind === 'sweep' ? a.kvco.nominal.hzPerV : null), extra: (a) => (a.kind === 'sweep' ? `at ${formatSi(a.kvco.nominal.v, 'V')}` : null) },
  { key: 'kvcoLow', parameter: 'Kvco, lowest over the usable range', unit: 'Hz/V', scaling: 'si', kinds: ['sweep'], value: (a) => (a.kind === 'sweep' ? a.kvco.minHzPerV : null) },
  { key: 'kvcoHigh', parameter: 'Kvco, highest over the usable range', unit: 'Hz/V', scaling: 'si', kinds: ['sweep'], value: (a) => (a.kind === 'sweep' ? a.kvco.maxHzPerV : null) },
  { key: 'kvcoLine', parameter: 'Kvco, best straight line', unit: 'Hz/V', scaling: 'si', kinds: ['sweep'], value: (a) => (a.kind === 'sweep' ? a.kvco.linear.slopeHzPerV : null) },
  { key: 'linearity', parameter: 'Linearity error (worst, of span)', unit: '%', scaling: 'plain', kinds: ['sweep'], value: (a) => (a.kind === 'sweep' ? a.kvco.linear.maxLinearityErrorPct : null), extra: (a) => (a.kind === 'sweep' ? `${formatSi(a.kvco.linear.fromV, 'V')} … ${formatSi(a.kvco.linear.toV, 'V')}` : null) },
  { key: 'stall', parameter: 'Stall threshold (oscillation starts)', unit: 'V', scaling: 'si', kinds: ['sweep'], value: (a) => (a.kind === 'sweep' ? a.stall.thresholdV : null) },
  { key: 'unstable', parameter: 'Unstable below', unit: 'V', scaling: 'si', kinds: ['sweep'], value: (a) => (a.kind === 'sweep' ? a.stall.unstableBelowV : null) },
  { key: 'tempco', parameter: 'Temperature coefficient', unit: 'ppm/°C', scaling: 'plain', kinds: ['drift'], value: (a) => (a.kind === 'drift' ? a.tempcoPpmPerC : null) },
  { key: 'warmup', parameter: 'Warm-up time', unit: 'min', scaling: 'plain', kinds: ['drift'], value: (a) => (a.kind === 'drift' && a.warmUp.warmUpS !== null ? a.warmUp.warmUpS / 60 : null), extra: (a) => (a.kind === 'drift' ? `drift within ${a.warmUp.limitPpmPerHour} ppm/h` : null) },
  { key: 'drift', parameter: 'Drift after warm-up', unit: 'ppm/h', scaling: 'plain', kinds: ['drift'], value: (a) => (a.kind === 'drift' ? a.driftPpmPerHour : null) },
  { key: 'adev1s', parameter: 'Allan deviation (overlapping), τ = 1 s', unit: '', scaling: 'plain', kinds: ['drift'], value: (a) => (a.kind === 'drift' ? (a.adev.find((p) => Math.abs(p.tauS - 1) < 1e-9)?.adev ?? null) : null) },
  { key: 'pushing', parameter: 'Supply pushing', unit: 'Hz/V', scaling: 'si', kinds: ['pushing'], value: (a) => (a.kind === 'pushing' ? a.pushingHzPerV : null), extra: (a) => (a.kind === 'pushing' ? `at ${formatSi(a.nominalSupplyV, 'V')} supply` : null) },
  { key: 'pushingPpm', parameter: 'Supply pushing, relative', unit: 'ppm/V', scaling: 'plain', kinds: ['pushing'], value: (a) => (a.kind === 'pushing' ? a.pushingPpmPerV : null) },
];

function median(sorted: number[]): number {
  const n = sorted.length;
  return n % 2 ? (sorted[(n - 1) >> 1] as number) : ((sorted[n / 2 - 1] as number) + (sorted[n / 2] as number)) / 2;
}

function span(values: number[], unit: string, scaling: 'si' | 'plain'): string {
  const lo = Math.min(...values);
  const hi = Math.max(...values);
  if (scaling === 'plain') return lo === hi ? `${lo.toFixed(1)} ${unit}` : `${lo.toFixed(1)} … ${hi.toFixed(1)} ${unit}`;
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

export function buildDatasheet(runs: DatasheetRun[], title = 'VCO gain table'): Datasheet {
  const rows: DatasheetRow[] = [];
  for (const spec of ROWS) {
    const contributing = runs.filter((r) => spec.kinds.includes(r.analysis.kind) && finite(spec.value(r.analysis)) !== null);
    if (contributing.length === 0) continue;
    const values = contributing.map((r) => spec.value(r.analysis) as number).sort((a, b) => a - b);
    const extras = spec.extra ? contributing.map((r) => spec.extra?.(r.analysis)).filter((s): s is string => !!s) : [];
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
    });
  }
  const notes = [
    'typ is the median over the runs that give the figure; min and max are shown when two or more runs do.',
    'Kvco figures come from the derivative of the fitted tuning curve over the usable (stable, oscillating) range.',
  ];
  for (const r of runs) {
    if ('warnings' in r.analysis) for (const w of r.analysis.warnings) notes.push(`${r.label}: ${w}`);
  }
  return { title, runs: runs.map((r) => ({ label: r.label, kind: r.analysis.kind })), rows, notes };
}
