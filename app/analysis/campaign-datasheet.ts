/**
 * The campaign's datasheet: min/typ/max across units and conditions with the
 * conditions stated, Kvco and frequency at each temperature, the temperature
 * coefficients, pushing from the supply corners, and the tuning headroom
 * over temperature. Markdown and CSV; formatting only, figures come from
 * analyzeCampaign.
 */
import type { CampaignAnalysis } from './campaign-analysis.ts';
import { formatPlain, formatSi, formatSiWithUncertainty } from './format-si.ts';

function conditionsText(a: CampaignAnalysis): string {
  const t = a.overall.temperatureRangeC;
  const s = a.overall.supplyRangeV;
  const temps = t ? `T ${formatPlain(t[0], '°C')} … ${formatPlain(t[1], '°C')}` : 'T —';
  const supply = s ? `supply ${formatSi(s[0], 'V', 3)} … ${formatSi(s[1], 'V', 3)}` : 'supply —';
  return `${temps}; ${supply}; ${a.overall.units.length} unit(s); at ${formatSi(a.nominalControlV, 'V', 3)} control`;
}

function coefficientSpread(
  byUnit: CampaignAnalysis['frequencyTempcoByUnit'],
): { min: number; typ: number; max: number; u: number } | null {
  const v = Object.values(byUnit).filter((x) => x !== null);
  if (v.length === 0) return null;
  const values = v.map((x) => x.ppmPerC);
  return {
    min: Math.min(...values),
    typ: values.reduce((s, x) => s + x, 0) / values.length,
    max: Math.max(...values),
    u: Math.max(...v.map((x) => x.uncertaintyPpmPerC)),
  };
}

export interface CampaignSheetRow {
  parameter: string;
  conditions: string;
  min: string;
  typ: string;
  max: string;
}

export function campaignSheetRows(a: CampaignAnalysis): CampaignSheetRow[] {
  const cond = conditionsText(a);
  const rows: CampaignSheetRow[] = [];
  const k = a.overall.kvcoHzPerV;
  if (k)
    rows.push({
      parameter: 'Kvco',
      conditions: cond,
      min: formatSi(k.min, 'Hz/V'),
      typ: formatSi(k.typ, 'Hz/V'),
      max: formatSi(k.max, 'Hz/V'),
    });
  const f = a.overall.frequencyHz;
  if (f)
    rows.push({
      parameter: 'Frequency',
      conditions: cond,
      min: formatSi(f.min, 'Hz'),
      typ: formatSi(f.typ, 'Hz'),
      max: formatSi(f.max, 'Hz'),
    });
  const ft = coefficientSpread(a.frequencyTempcoByUnit);
  if (ft)
    rows.push({
      parameter: 'Frequency tempco',
      conditions: `${cond}; nominal supply`,
      min: formatPlain(ft.min, 'ppm/°C'),
      typ: formatSiWithUncertainty(ft.typ, ft.u, 'ppm/°C'),
      max: formatPlain(ft.max, 'ppm/°C'),
    });
  const kt = coefficientSpread(a.kvcoTempcoByUnit);
  if (kt)
    rows.push({
      parameter: 'Kvco tempco',
      conditions: `${cond}; nominal supply`,
      min: formatPlain(kt.min, 'ppm/°C'),
      typ: formatSiWithUncertainty(kt.typ, kt.u, 'ppm/°C'),
      max: formatPlain(kt.max, 'ppm/°C'),
    });
  const p = a.pushingHzPerV;
  if (p)
    rows.push({
      parameter: 'Supply pushing',
      conditions: `${cond}; from the supply corners`,
      min: formatSi(p.min, 'Hz/V', 3),
      typ: formatSi(p.typ, 'Hz/V', 3),
      max: formatSi(p.max, 'Hz/V', 3),
    });
  for (const t of a.perTemperature) {
    rows.push({
      parameter: `Kvco at ${formatPlain(t.temperatureC, '°C')}`,
      conditions: `DUT ${formatPlain(t.dutTemperatureC, '°C')}; ${t.n} sweep(s)`,
      min: formatSi(t.kvcoMinHzPerV, 'Hz/V'),
      typ: formatSi(t.kvcoTypHzPerV, 'Hz/V'),
      max: formatSi(t.kvcoMaxHzPerV, 'Hz/V'),
    });
  }
  return rows;
}

export function renderCampaignMarkdown(a: CampaignAnalysis, title = 'VCO characterisation over conditions'): string {
  const lines = [`## ${title}`, '', '| Parameter | Conditions | Min | Typ | Max |', '|---|---|---|---|---|'];
  for (const r of campaignSheetRows(a))
    lines.push(`| ${r.parameter} | ${r.conditions} | ${r.min} | ${r.typ} | ${r.max} |`);
  lines.push(
    '',
    `### Tuning headroom over temperature (hold ${formatSi(a.headroomTargetHz, 'Hz')}, window ${formatSi(a.tuningWindowV[0], 'V', 3)} … ${formatSi(a.tuningWindowV[1], 'V', 3)})`,
    '',
  );
  lines.push(
    '| Unit | Chamber | DUT | Control voltage | Margin low | Margin high | Stall edge | Holds |',
    '|---|---|---|---|---|---|---|---|',
  );
  for (const h of a.headroom) {
    lines.push(
      `| ${h.unit} | ${formatPlain(h.temperatureC, '°C')} | ${formatPlain(h.dutTemperatureC, '°C')} | ${formatSi(h.controlV, 'V', 4)} | ${formatSi(h.marginLowV, 'V', 3)} | ${formatSi(h.marginHighV, 'V', 3)} | ${formatSi(h.stallV, 'V', 3)} | ${h.inWindow ? 'yes' : 'NO'} |`,
    );
  }
  lines.push('');
  return lines.join('\n');
}

function csvCell(text: string): string {
  return /[",\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

export function renderCampaignCsv(a: CampaignAnalysis): string {
  const out = ['parameter,conditions,min,typ,max'];
  for (const r of campaignSheetRows(a))
    out.push([r.parameter, r.conditions, r.min, r.typ, r.max].map(csvCell).join(','));
  out.push('', 'unit,chamber_c,dut_c,control_v,margin_low_v,margin_high_v,stall_v,holds');
  for (const h of a.headroom)
    out.push(
      [
        h.unit,
        h.temperatureC,
        h.dutTemperatureC ?? '',
        h.controlV ?? '',
        h.marginLowV ?? '',
        h.marginHighV ?? '',
        h.stallV ?? '',
        h.inWindow,
      ]
        .map((x) => csvCell(String(x)))
        .join(','),
    );
  return `${out.join('\n')}\n`;
}
