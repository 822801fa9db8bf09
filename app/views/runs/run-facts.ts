/**
 * A stored run's facts in words: plan settings with their units, the
 * conditions around it, the instruments and the time window. Pure, so the
 * wording is tested with real plans.
 */
import { formatFigure } from '../../analysis/format-figure.ts';
import { formatNumber, formatSi } from '../../analysis/format-si.ts';
import type { RunMeta } from '../../contract/bench-api.ts';
import { duration } from '../units.ts';

/** Unit of a plan key by the project's naming rule (SI suffix in the name); sweep bounds are volts. */
function unitOf(path: string): string {
  const key = path.split('.').at(-1) ?? '';
  if (/^(start|stop|step|points)$/.test(key) || /V$/.test(key)) return 'V';
  if (/S$/.test(key) || key === 'seconds') return 's';
  if (/A$/.test(key)) return 'A';
  if (/Hz$/.test(key)) return 'Hz';
  return '';
}

/** A setting as typed: no padding zeros ("500 mV", "4.5 V", "3"). */
function settingText(value: number, unit: string): string {
  if (!unit)
    return Number.isInteger(value)
      ? String(value)
      : formatNumber(value, 6)
          .replace(/(\.\d*?)0+$/, '$1')
          .replace(/\.$/, '');
  return formatSi(value, unit, 6)
    .replace(/(\.\d*?)0+ /, '$1 ')
    .replace(/\. /, ' ');
}

function valueText(path: string, value: unknown): string {
  if (typeof value === 'boolean') return value ? 'yes' : 'no';
  if (typeof value === 'number') {
    return settingText(value, unitOf(path));
  }
  if (typeof value === 'string') return value;
  if (Array.isArray(value)) {
    const unit = unitOf(path);
    const shown = value.slice(0, 8).map((v) => (typeof v === 'number' ? settingText(v, unit) : String(v)));
    return value.length > 8 ? `${shown.join(', ')} … (${value.length} in all)` : shown.join(', ');
  }
  return '—';
}

/** The plan editors' own words for the settings they write; other keys show as stored. */
const LABELS: Record<string, string> = {
  start: 'From',
  stop: 'To',
  step: 'Step',
  points: 'Setpoints',
  direction: 'Direction',
  readingsPerPoint: 'Readings per point',
  gateS: 'Counter gate',
  'settle.mode': 'Settling',
  'settle.maxS': 'Longest settling wait',
  'settle.seconds': 'Settling wait',
  'settle.toleranceCounts': 'Settled within (counts)',
  refineEdgeV: 'Edge resolution',
  'limits.maxControlV': 'Highest control voltage',
  'limits.currentLimitA': 'Current limit, control port',
  'limits.ovpV': 'Over-voltage protection',
  'safe.controlV': 'Safe control voltage',
  'safe.outputOff': 'Output off when safe',
  controlV: 'Hold control at',
  intervalS: 'Every',
  durationS: 'For',
};

/** Plan settings as [setting, value] rows in the editors' words (unknown keys dotted: "limits.maxControlV"). */
export function planRows(plan: unknown): [string, string][] {
  return planEntries(plan).map(([key, value]) => [LABELS[key] ?? key, value]);
}

function planEntries(plan: unknown, prefix = ''): [string, string][] {
  if (!plan || typeof plan !== 'object' || Array.isArray(plan)) return [];
  const rows: [string, string][] = [];
  for (const [key, value] of Object.entries(plan as Record<string, unknown>)) {
    const path = prefix ? `${prefix}.${key}` : key;
    if (value && typeof value === 'object' && !Array.isArray(value)) rows.push(...planEntries(value, path));
    else rows.push([path, valueText(path, value)]);
  }
  return rows;
}

/** "4 Mar 2026 05:06:07 → 05:21:07 (15 min 00 s)" in local time; "still running" without an end. */
export function runWindow(meta: Pick<RunMeta, 'startedAt' | 'endedAt'>): string {
  const start = new Date(meta.startedAt);
  if (Number.isNaN(start.getTime())) return meta.startedAt;
  const startText = start.toLocaleString(undefined, {
    day: 'numeric',
    month: 'short',
    year: 'numeric',
    hour: '2-digit',
    minute: '2-digit',
    second: '2-digit',
    hour12: false,
  });
  if (!meta.endedAt) return `${startText} → still running`;
  const end = new Date(meta.endedAt);
  if (Number.isNaN(end.getTime())) return startText;
  const endText = end.toLocaleTimeString(undefined, {
    hour: '2-digit',
    minute: '2-digit',
    second: '2-digit',
    hour12: false,
  });
  return `${startText} → ${endText} (${duration((end.getTime() - start.getTime()) / 1000)})`;
}

/** Conditions as rows: DUT supply and temperature at start and end. */
export function conditionRows(meta: Pick<RunMeta, 'conditions'>): [string, string][] {
  const c = meta.conditions;
  if (!c) return [];
  const span = (s: { start: number | null; end: number | null }, unit: string, digits: number) =>
    `${formatFigure(s.start, unit, { digits })} at start, ${formatFigure(s.end, unit, { digits })} at end`;
  return [
    ['DUT supply', span(c.dutSupplyV, 'V', 4)],
    ['Temperature', span(c.temperatureC, '°C', 4)],
  ];
}
