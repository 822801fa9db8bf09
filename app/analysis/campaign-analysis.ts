/**
 * A campaign over conditions, pure: per condition the frequency and Kvco at
 * the nominal control voltage (campaign-local.ts), then across them the
 * temperature coefficients (least-squares line against the DUT's measured
 * temperature, divided by the line's value at the reference temperature),
 * the supply pushing from the corners, and the tuning headroom: the control
 * voltage that holds a target frequency at each temperature, against the
 * tuning window a loop can drive.
 */
import { localFigures, voltageForFrequency, type SweepPointLite } from './campaign-local.ts';

export interface CampaignConditionInput {
  index: number;
  unit: string;
  temperatureC: number;
  /** Mean of the DUT thermometer at the sweep's start and end; null when unread. */
  dutTemperatureC: number | null;
  supplyV: number;
  runId: string | null;
  status: string;
  points: readonly SweepPointLite[] | null;
  /** Lower stall edge of the sweep, V (null: none found). */
  stallV: number | null;
}

export interface CampaignAnalysisOptions {
  nominalControlV: number;
  nominalSupplyV: number;
  tuningWindowV: [number, number];
  headroomTargetHz?: number | undefined;
  referenceC?: number;
}

export interface CampaignConditionResult {
  index: number;
  temperatureC: number;
  dutTemperatureC: number | null;
  supplyV: number;
  unit: string;
  runId: string | null;
  status: string;
  kvcoAtNominalHzPerV: number | null;
  kvcoUncertaintyHzPerV: number | null;
  frequencyAtNominalHz: number | null;
  frequencyUncertaintyHz: number | null;
  stallV: number | null;
}

export interface Coefficient {
  ppmPerC: number;
  uncertaintyPpmPerC: number;
  points: number;
}

export interface HeadroomRow {
  unit: string;
  temperatureC: number;
  dutTemperatureC: number | null;
  /** Control voltage holding headroomTargetHz at nominal supply; null if the sweep never reaches it. */
  controlV: number | null;
  /** controlV − window low, window high − controlV (negative: outside the window). */
  marginLowV: number | null;
  marginHighV: number | null;
  /** The stall edge at this temperature, when the sweep found one. */
  stallV: number | null;
  inWindow: boolean;
}

export interface CampaignAnalysis {
  kind: 'campaign';
  nominalControlV: number;
  nominalSupplyV: number;
  referenceC: number;
  conditions: CampaignConditionResult[];
  /** Per unit, then across units (typ = mean, min, max). */
  frequencyTempcoPpmPerC: number | null;
  frequencyTempcoByUnit: Record<string, Coefficient | null>;
  kvcoTempcoPpmPerC: number | null;
  kvcoTempcoByUnit: Record<string, Coefficient | null>;
  perTemperature: {
    temperatureC: number;
    dutTemperatureC: number | null;
    kvcoMinHzPerV: number;
    kvcoTypHzPerV: number;
    kvcoMaxHzPerV: number;
    frequencyTypHz: number;
    n: number;
  }[];
  pushing: { unit: string; temperatureC: number; hzPerV: number; points: number }[];
  pushingHzPerV: { min: number; typ: number; max: number } | null;
  headroomTargetHz: number | null;
  tuningWindowV: [number, number];
  headroom: HeadroomRow[];
  overall: {
    kvcoHzPerV: { min: number; typ: number; max: number } | null;
    frequencyHz: { min: number; typ: number; max: number } | null;
    temperatureRangeC: [number, number] | null;
    supplyRangeV: [number, number] | null;
    units: string[];
  };
}

/** Least-squares line y = a + b·x; b, its standard error, and y at x0. */
export function line(
  x: readonly number[],
  y: readonly number[],
  x0: number,
): { slope: number; slopeSe: number; at: number } | null {
  const n = x.length;
  if (n < 2) return null;
  const mx = x.reduce((s, v) => s + v, 0) / n;
  const my = y.reduce((s, v) => s + v, 0) / n;
  let sxx = 0;
  let sxy = 0;
  for (let i = 0; i < n; i++) {
    sxx += ((x[i] as number) - mx) ** 2;
    sxy += ((x[i] as number) - mx) * ((y[i] as number) - my);
  }
  if (!(sxx > 0)) return null;
  const slope = sxy / sxx;
  let rss = 0;
  for (let i = 0; i < n; i++) rss += ((y[i] as number) - (my + slope * ((x[i] as number) - mx))) ** 2;
  const slopeSe = n > 2 ? Math.sqrt(rss / (n - 2) / sxx) : Number.NaN;
  return { slope, slopeSe, at: my + slope * (x0 - mx) };
}

function spread(values: readonly number[]): { min: number; typ: number; max: number } | null {
  if (values.length === 0) return null;
  return { min: Math.min(...values), typ: values.reduce((s, v) => s + v, 0) / values.length, max: Math.max(...values) };
}

function coefficient(
  rows: CampaignConditionResult[],
  pick: (r: CampaignConditionResult) => number | null,
  referenceC: number,
): Coefficient | null {
  const use = rows.filter((r) => r.dutTemperatureC !== null && pick(r) !== null);
  const fit = line(
    use.map((r) => r.dutTemperatureC as number),
    use.map((r) => pick(r) as number),
    referenceC,
  );
  if (fit === null || !(fit.at !== 0)) return null;
  return {
    ppmPerC: (fit.slope / fit.at) * 1e6,
    uncertaintyPpmPerC: Math.abs(fit.slopeSe / fit.at) * 1e6,
    points: use.length,
  };
}

export function analyzeCampaign(
  inputs: readonly CampaignConditionInput[],
  options: CampaignAnalysisOptions,
): CampaignAnalysis {
  const referenceC = options.referenceC ?? 25;
  const conditions: CampaignConditionResult[] = inputs.map((c) => {
    const local = c.points && c.status === 'done' ? localFigures(c.points, options.nominalControlV) : null;
    return {
      index: c.index,
      temperatureC: c.temperatureC,
      dutTemperatureC: c.dutTemperatureC,
      supplyV: c.supplyV,
      unit: c.unit,
      runId: c.runId,
      status: c.status,
      kvcoAtNominalHzPerV: local?.kvcoHzPerV ?? null,
      kvcoUncertaintyHzPerV: local?.kvcoUncertaintyHzPerV ?? null,
      frequencyAtNominalHz: local?.frequencyHz ?? null,
      frequencyUncertaintyHz: local?.frequencyUncertaintyHz ?? null,
      stallV: c.stallV,
    };
  });
  const units = [...new Set(inputs.map((c) => c.unit))];
  const atNominalSupply = (r: CampaignConditionResult): boolean => Math.abs(r.supplyV - options.nominalSupplyV) < 1e-9;
  const frequencyTempcoByUnit: Record<string, Coefficient | null> = {};
  const kvcoTempcoByUnit: Record<string, Coefficient | null> = {};
  for (const unit of units) {
    const rows = conditions.filter((r) => r.unit === unit && atNominalSupply(r));
    frequencyTempcoByUnit[unit] = coefficient(rows, (r) => r.frequencyAtNominalHz, referenceC);
    kvcoTempcoByUnit[unit] = coefficient(rows, (r) => r.kvcoAtNominalHzPerV, referenceC);
  }
  const mean = (xs: (Coefficient | null)[]): number | null => {
    const v = xs.filter((x): x is Coefficient => x !== null).map((x) => x.ppmPerC);
    return v.length === 0 ? null : v.reduce((s, x) => s + x, 0) / v.length;
  };

  const temps = [...new Set(inputs.map((c) => c.temperatureC))].sort((a, b) => a - b);
  const perTemperature = temps.flatMap((t) => {
    const rows = conditions.filter((r) => r.temperatureC === t && r.kvcoAtNominalHzPerV !== null);
    const k = spread(rows.map((r) => r.kvcoAtNominalHzPerV as number));
    const f = spread(rows.map((r) => r.frequencyAtNominalHz as number));
    const dut = rows.filter((r) => r.dutTemperatureC !== null).map((r) => r.dutTemperatureC as number);
    if (!k || !f) return [];
    return [
      {
        temperatureC: t,
        dutTemperatureC: dut.length ? dut.reduce((s, x) => s + x, 0) / dut.length : null,
        kvcoMinHzPerV: k.min,
        kvcoTypHzPerV: k.typ,
        kvcoMaxHzPerV: k.max,
        frequencyTypHz: f.typ,
        n: rows.length,
      },
    ];
  });

  const pushing: CampaignAnalysis['pushing'] = [];
  for (const unit of units) {
    for (const t of temps) {
      const rows = conditions.filter((r) => r.unit === unit && r.temperatureC === t && r.frequencyAtNominalHz !== null);
      const fit = line(
        rows.map((r) => r.supplyV),
        rows.map((r) => r.frequencyAtNominalHz as number),
        options.nominalSupplyV,
      );
      if (fit) pushing.push({ unit, temperatureC: t, hzPerV: fit.slope, points: rows.length });
    }
  }

  const reference = conditions
    .filter((r) => atNominalSupply(r) && r.frequencyAtNominalHz !== null)
    .sort((a, b) => Math.abs(a.temperatureC - referenceC) - Math.abs(b.temperatureC - referenceC))[0];
  const targetHz = options.headroomTargetHz ?? reference?.frequencyAtNominalHz ?? null;
  const [winLo, winHi] = options.tuningWindowV;
  const headroom: HeadroomRow[] = [];
  if (targetHz !== null) {
    for (const c of inputs) {
      if (Math.abs(c.supplyV - options.nominalSupplyV) >= 1e-9 || c.points === null || c.status !== 'done') continue;
      const v = voltageForFrequency(c.points, targetHz);
      headroom.push({
        unit: c.unit,
        temperatureC: c.temperatureC,
        dutTemperatureC: c.dutTemperatureC,
        controlV: v,
        marginLowV: v === null ? null : v - Math.max(winLo, c.stallV ?? winLo),
        marginHighV: v === null ? null : winHi - v,
        stallV: c.stallV,
        inWindow: v !== null && v >= Math.max(winLo, c.stallV ?? winLo) && v <= winHi,
      });
    }
  }

  const done = conditions.filter((r) => r.kvcoAtNominalHzPerV !== null);
  return {
    kind: 'campaign',
    nominalControlV: options.nominalControlV,
    nominalSupplyV: options.nominalSupplyV,
    referenceC,
    conditions,
    frequencyTempcoPpmPerC: mean(Object.values(frequencyTempcoByUnit)),
    frequencyTempcoByUnit,
    kvcoTempcoPpmPerC: mean(Object.values(kvcoTempcoByUnit)),
    kvcoTempcoByUnit,
    perTemperature,
    pushing,
    pushingHzPerV: spread(pushing.map((p) => p.hzPerV)),
    headroomTargetHz: targetHz,
    tuningWindowV: options.tuningWindowV,
    headroom,
    overall: {
      kvcoHzPerV: spread(done.map((r) => r.kvcoAtNominalHzPerV as number)),
      frequencyHz: spread(done.map((r) => r.frequencyAtNominalHz as number)),
      temperatureRangeC: temps.length ? [temps[0] as number, temps[temps.length - 1] as number] : null,
      supplyRangeV: inputs.length
        ? [Math.min(...inputs.map((c) => c.supplyV)), Math.max(...inputs.map((c) => c.supplyV))]
        : null,
      units,
    },
  };
}
