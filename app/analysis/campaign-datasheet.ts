/**
 * The campaign's datasheet: min/typ/max across units and conditions with the
 * conditions stated (temperature and supply ranges), Kvco and frequency at
 * each temperature, the temperature coefficients, pushing from the supply
 * corners, and the tuning headroom over temperature. Markdown, CSV (SI base
 * units) and one printable HTML page; formatting only — the figures come
 * from analyzeCampaign, and every one is shown with its ± through
 * formatFigure (format-figure.ts).
 */
import { spreadOf, type CampaignAnalysis, type HeadroomRow, type SpreadFigure } from './campaign-analysis.ts';
import { html, htmlPage, htmlTable, mdEscape, SIMULATED_BANNER } from './datasheet-render.ts';
import { formatFigure } from './format-figure.ts';

/** One figure and its 1σ uncertainty (null: unknown), SI units. */
export interface SheetFigure {
  value: number;
  uncertainty: number | null;
}

export interface CampaignSheetRow {
  /** Stable machine key (CSV). */
  key: string;
  parameter: string;
  conditions: string;
  unit: string;
  min: SheetFigure | null;
  typ: SheetFigure | null;
  max: SheetFigure | null;
}

/** A setpoint or a DUT temperature, to the thermometer's 0.1 °C. */
export function celsiusText(value: number | null): string {
  return formatFigure(value, '°C', { resolution: 0.1 });
}

/** A supply setpoint, to the millivolt it was written with. */
function voltsText(value: number): string {
  return formatFigure(value, 'V', { resolution: 0.001 });
}

function rangeText(range: [number, number] | null, text: (v: number) => string): string {
  if (range === null) return '—';
  return range[0] === range[1] ? text(range[0]) : `${text(range[0])} … ${text(range[1])}`;
}

/** "T −10.0 °C … 60.0 °C; supply 4.750 V … 5.250 V; 2 units; control 3.000 V". */
export function campaignConditionsText(a: CampaignAnalysis): string {
  const units = a.overall.units.length;
  return [
    `T ${rangeText(a.overall.temperatureRangeC, celsiusText)}`,
    `supply ${rangeText(a.overall.supplyRangeV, voltsText)}`,
    `${units} unit${units === 1 ? '' : 's'}`,
    `control ${voltsText(a.nominalControlV)}`,
  ].join('; ');
}

function fromSpread(s: SpreadFigure): Pick<CampaignSheetRow, 'min' | 'typ' | 'max'> {
  return {
    min: { value: s.min, uncertainty: s.minUncertainty },
    typ: { value: s.typ, uncertainty: s.typUncertainty },
    max: { value: s.max, uncertainty: s.maxUncertainty },
  };
}

/** Per-unit coefficients across units: min/max each with its own uncertainty, typ the mean's. */
function coefficientSpread(byUnit: CampaignAnalysis['frequencyTempcoByUnit']): SpreadFigure | null {
  const v = Object.values(byUnit).filter((x) => x !== null);
  return spreadOf(v.map((x) => ({ value: x.ppmPerC, u: x.uncertaintyPpmPerC })));
}

export function campaignSheetRows(a: CampaignAnalysis): CampaignSheetRow[] {
  const cond = campaignConditionsText(a);
  const nominal = `nominal supply ${voltsText(a.nominalSupplyV)}`;
  const rows: CampaignSheetRow[] = [];
  const k = a.overall.kvcoHzPerV;
  if (k) rows.push({ key: 'kvco', parameter: 'Kvco', conditions: cond, unit: 'Hz/V', ...fromSpread(k) });
  const f = a.overall.frequencyHz;
  if (f) rows.push({ key: 'frequency', parameter: 'Frequency', conditions: cond, unit: 'Hz', ...fromSpread(f) });
  const ft = coefficientSpread(a.frequencyTempcoByUnit);
  if (ft)
    rows.push({
      key: 'frequency_tempco',
      parameter: 'Frequency tempco',
      conditions: `${cond}; ${nominal}; line against the DUT's temperature`,
      unit: 'ppm/°C',
      ...fromSpread(ft),
    });
  const kt = coefficientSpread(a.kvcoTempcoByUnit);
  if (kt)
    rows.push({
      key: 'kvco_tempco',
      parameter: 'Kvco tempco',
      conditions: `${cond}; ${nominal}; line against the DUT's temperature`,
      unit: 'ppm/°C',
      ...fromSpread(kt),
    });
  const p = a.pushingHzPerV;
  if (p)
    rows.push({
      key: 'pushing',
      parameter: 'Supply pushing',
      conditions: `${cond}; slope over the supply corners at each temperature`,
      unit: 'Hz/V',
      ...fromSpread(p),
    });
  for (const t of a.perTemperature) {
    const where = `chamber ${celsiusText(t.temperatureC)}, DUT ${celsiusText(t.dutTemperatureC)}; supply ${rangeText(t.supplyRangeV, voltsText)}; ${t.n} sweep${t.n === 1 ? '' : 's'}`;
    rows.push({
      key: `kvco_at_${t.temperatureC}c`,
      parameter: `Kvco at ${celsiusText(t.temperatureC)}`,
      conditions: where,
      unit: 'Hz/V',
      ...fromSpread(t.kvco),
    });
    rows.push({
      key: `frequency_at_${t.temperatureC}c`,
      parameter: `Frequency at ${celsiusText(t.temperatureC)}`,
      conditions: where,
      unit: 'Hz',
      ...fromSpread(t.frequency),
    });
  }
  return rows;
}

function figureText(f: SheetFigure | null, unit: string): string {
  return f === null ? '' : formatFigure(f.value, unit, { uncertainty: f.uncertainty });
}

export interface HeadroomCells {
  unit: string;
  chamber: string;
  dut: string;
  controlV: string;
  marginLow: string;
  marginHigh: string;
  stall: string;
  holds: string;
}

/** One headroom row as people read it; the margins carry controlV's uncertainty. */
export function headroomCells(h: HeadroomRow): HeadroomCells {
  const u = h.controlUncertaintyV;
  return {
    unit: h.unit,
    chamber: celsiusText(h.temperatureC),
    dut: celsiusText(h.dutTemperatureC),
    controlV: formatFigure(h.controlV, 'V', { uncertainty: u, digits: 4 }),
    marginLow: formatFigure(h.marginLowV, 'V', { uncertainty: u, digits: 3 }),
    marginHigh: formatFigure(h.marginHighV, 'V', { uncertainty: u, digits: 3 }),
    stall: h.stallV === null ? 'none found' : formatFigure(h.stallV, 'V', { uncertainty: h.stallUncertaintyV }),
    holds: h.controlV === null ? 'NO (never reached)' : h.inWindow ? 'yes' : 'NO',
  };
}

function headroomHeading(a: CampaignAnalysis): string {
  return `Tuning headroom over temperature (hold ${formatFigure(a.headroomTargetHz, 'Hz', { digits: 6 })} at ${voltsText(a.nominalSupplyV)} supply; window ${voltsText(a.tuningWindowV[0])} … ${voltsText(a.tuningWindowV[1])})`;
}

const HEADROOM_HEAD = ['Unit', 'Chamber', 'DUT', 'Control voltage', 'Margin low', 'Margin high', 'Stall edge', 'Holds'];
const HEAD = ['Parameter', 'Conditions', 'Min', 'Typ', 'Max'];

function headroomRow(c: HeadroomCells): string[] {
  return [c.unit, c.chamber, c.dut, c.controlV, c.marginLow, c.marginHigh, c.stall, c.holds];
}

function sheetCells(r: CampaignSheetRow): string[] {
  return [r.parameter, r.conditions, figureText(r.min, r.unit), figureText(r.typ, r.unit), figureText(r.max, r.unit)];
}

const NOTE =
  'Min and max carry their own condition’s 1σ; typ is the mean with √Σu²/n. Frequency and Kvco are read at the nominal control voltage from a local quadratic over each sweep.';

export function renderCampaignMarkdown(a: CampaignAnalysis, title = 'VCO characterisation over conditions'): string {
  const lines = [`## ${mdEscape(title)}`, ''];
  if (a.simulated) lines.push(`**${SIMULATED_BANNER}**`, '');
  lines.push(`| ${HEAD.join(' | ')} |`, '|---|---|--:|--:|--:|');
  for (const r of campaignSheetRows(a)) lines.push(`| ${sheetCells(r).map(mdEscape).join(' | ')} |`);
  lines.push('', `### ${mdEscape(headroomHeading(a))}`, '');
  lines.push(`| ${HEADROOM_HEAD.join(' | ')} |`, '|---|---|---|--:|--:|--:|--:|---|');
  for (const h of a.headroom) lines.push(`| ${headroomRow(headroomCells(h)).map(mdEscape).join(' | ')} |`);
  lines.push('', `- ${mdEscape(NOTE)}`, '');
  return lines.join('\n');
}

function csvCell(text: string): string {
  return /[",\n\r]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

/** CSV in SI base units, full precision: one row per figure, then the headroom table. */
export function renderCampaignCsv(a: CampaignAnalysis): string {
  const num = (v: number | null | undefined): string => (v === null || v === undefined ? '' : String(v));
  const out = ['key,parameter,conditions,min,min_u,typ,typ_u,max,max_u,unit,bench'];
  const bench = a.simulated ? 'simulated' : 'measured';
  for (const r of campaignSheetRows(a))
    out.push(
      [
        r.key,
        r.parameter,
        r.conditions,
        num(r.min?.value),
        num(r.min?.uncertainty),
        num(r.typ?.value),
        num(r.typ?.uncertainty),
        num(r.max?.value),
        num(r.max?.uncertainty),
        r.unit,
        bench,
      ]
        .map(csvCell)
        .join(','),
    );
  out.push('', 'unit,chamber_c,dut_c,control_v,control_u_v,margin_low_v,margin_high_v,stall_v,holds');
  for (const h of a.headroom)
    out.push(
      [
        h.unit,
        num(h.temperatureC),
        num(h.dutTemperatureC),
        num(h.controlV),
        num(h.controlUncertaintyV),
        num(h.marginLowV),
        num(h.marginHighV),
        num(h.stallV),
        String(h.inWindow),
      ]
        .map(csvCell)
        .join(','),
    );
  return `${out.join('\n')}\n`;
}

/** One self-contained printable page, escaped and styled like the gain table's HTML export. */
export function renderCampaignHtml(a: CampaignAnalysis, title = 'VCO characterisation over conditions'): string {
  const td = (text: string, num = false): string => `<td${num ? ' class="num"' : ''}>${html(text)}</td>`;
  const body = campaignSheetRows(a)
    .map((r) => {
      const [parameter, conditions, ...figures] = sheetCells(r);
      return `<tr>${td(parameter as string)}${td(conditions as string)}${figures.map((f) => td(f, true)).join('')}</tr>`;
    })
    .join('\n');
  const headroom = a.headroom
    .map((h) => {
      const cells = headroomRow(headroomCells(h));
      return `<tr${h.inWindow ? '' : ' class="fails"'}>${cells.map((c, i) => td(c, i >= 3 && i <= 6)).join('')}</tr>`;
    })
    .join('\n');
  return htmlPage({
    title,
    simulated: a.simulated,
    lead: campaignConditionsText(a),
    body: `${htmlTable(HEAD, body)}\n<h2>${html(headroomHeading(a))}</h2>\n${htmlTable(HEADROOM_HEAD, headroom)}`,
    notes: [NOTE],
    extraStyle: '  tr.fails td { font-weight: 600; }\n  h2 { font-size: 13pt; margin: 1.5em 0 0.4em; }\n',
  });
}
