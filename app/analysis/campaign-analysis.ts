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
  /** ± of stallV (half the local step), V. */
  stallUncertaintyV?: number | null;
  /** The run was taken on the simulated bench (run.json `simulated`). */
  simulated?: boolean;
}

/**
 * Min, typ (mean) and max across units or conditions, each with its 1σ
 * measurement uncertainty: min and max carry their own condition's, typ the
 * mean's, √Σu²/n (the spread itself is the min…max, not an uncertainty).
 */
export interface SpreadFigure {
  min: number;
  minUncertainty: number | null;
  typ: number;
  typUncertainty: number | null;
  max: number;
  maxUncertainty: number | null;
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
  /** 1σ of controlV: the local fit's frequency uncertainty over its slope there. */
  controlUncertaintyV: number | null;
  /** controlV − window low, window high − controlV (negative: outside the window). */
  marginLowV: number | null;
  marginHighV: number | null;
  /** The stall edge at this temperature, when the sweep found one, and its ±. */
  stallV: number | null;
  stallUncertaintyV: number | null;
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
    /** Kvco and frequency at this temperature across units and supply corners, with uncertainties. */
    kvco: SpreadFigure;
    frequency: SpreadFigure;
    supplyRangeV: [number, number];
    n: number;
  }[];
  pushing: { unit: string; temperatureC: number; hzPerV: number; uncertaintyHzPerV: number | null; points: number }[];
  pushingHzPerV: SpreadFigure | null;
  headroomTargetHz: number | null;
  tuningWindowV: [number, number];
  headroom: HeadroomRow[];
  /** Any run of the campaign came from the simulated bench. */
  simulated: boolean;
  overall: {
    kvcoHzPerV: SpreadFigure | null;
    frequencyHz: SpreadFigure | null;
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

/** Min/typ/max of values with their uncertainties (null: unknown; a mean with any unknown is unknown). */
export function spreadOf(items: readonly { value: number; u: number | null }[]): SpreadFigure | null {
  if (items.length === 0) return null;
  let lo = items[0] as { value: number; u: number | null };
  let hi = lo;
  let sum = 0;
  let sumU2: number | null = 0;
  for (const item of items) {
    if (item.value < lo.value) lo = item;
    if (item.value > hi.value) hi = item;
    sum += item.value;
    sumU2 = sumU2 === null || item.u === null || !Number.isFinite(item.u) ? null : sumU2 + item.u * item.u;
  }
  const finite = (u: number | null): number | null => (u !== null && Number.isFinite(u) ? u : null);
  return {
    min: lo.value,
    minUncertainty: finite(lo.u),
    typ: sum / items.length,
    typUncertainty: sumU2 === null ? null : Math.sqrt(sumU2) / items.length,
    max: hi.value,
    maxUncertainty: finite(hi.u),
  };
}

/**
 * Standard uncertainty of a least-squares slope from the points' own
 * uncertainties: u_b² = Σ((x_i − x̄)/Sxx)²·u_i² (GUM propagation, common
 * practice). With two points the residuals say nothing; this still does.
 */
function propagatedSlopeU(x: readonly number[], u: readonly number[]): number {
  const mx = x.reduce((s, v) => s + v, 0) / x.length;
  const sxx = x.reduce((s, v) => s + (v - mx) ** 2, 0);
  let sum = 0;
  for (let i = 0; i < x.length; i++) sum += (((x[i] as number) - mx) / sxx) ** 2 * (u[i] as number) ** 2;
  return Math.sqrt(sum);
}

/**
 * A slope's uncertainty: with two points only the points' own (propagated);
 * with more, the larger of that and the residuals' scatter. NaN when neither
 * is known.
 */
function slopeUncertainty(residualSe: number, x: readonly number[], u: readonly (number | null)[]): number {
  const known = u.every((v) => v !== null && Number.isFinite(v));
  const propagated = known ? propagatedSlopeU(x, u as number[]) : Number.NaN;
  if (!Number.isFinite(residualSe)) return propagated;
  return Number.isFinite(propagated) ? Math.max(residualSe, propagated) : residualSe;
}

function coefficient(
  rows: CampaignConditionResult[],
  pick: (r: CampaignConditionResult) => number | null,
  pickU: (r: CampaignConditionResult) => number | null,
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
    uncertaintyPpmPerC:
      (Math.abs(
        slopeUncertainty(
          fit.slopeSe,
          use.map((r) => r.dutTemperatureC as number),
          use.map(pickU),
        ),
      ) /
        Math.abs(fit.at)) *
      1e6,
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
    frequencyTempcoByUnit[unit] = coefficient(
      rows,
      (r) => r.frequencyAtNominalHz,
      (r) => r.frequencyUncertaintyHz,
      referenceC,
    );
    kvcoTempcoByUnit[unit] = coefficient(
      rows,
      (r) => r.kvcoAtNominalHzPerV,
      (r) => r.kvcoUncertaintyHzPerV,
      referenceC,
    );
  }
  const mean = (xs: (Coefficient | null)[]): number | null => {
    const v = xs.filter((x): x is Coefficient => x !== null).map((x) => x.ppmPerC);
    return v.length === 0 ? null : v.reduce((s, x) => s + x, 0) / v.length;
  };

  const temps = [...new Set(inputs.map((c) => c.temperatureC))].sort((a, b) => a - b);
  const perTemperature = temps.flatMap((t) => {
    const rows = conditions.filter((r) => r.temperatureC === t && r.kvcoAtNominalHzPerV !== null);
    const k = spreadOf(rows.map((r) => ({ value: r.kvcoAtNominalHzPerV as number, u: r.kvcoUncertaintyHzPerV })));
    const f = spreadOf(rows.map((r) => ({ value: r.frequencyAtNominalHz as number, u: r.frequencyUncertaintyHz })));
    const supplies = rows.map((r) => r.supplyV);
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
        kvco: k,
        frequency: f,
        supplyRangeV: [Math.min(...supplies), Math.max(...supplies)] as [number, number],
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
      if (!fit) continue;
      const uncertainty = slopeUncertainty(
        fit.slopeSe,
        rows.map((r) => r.supplyV),
        rows.map((r) => r.frequencyUncertaintyHz),
      );
      pushing.push({ unit, temperatureC: t, hzPerV: fit.slope, uncertaintyHzPerV: uncertainty, points: rows.length });
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
      const there = v === null ? null : localFigures(c.points, v);
      headroom.push({
        unit: c.unit,
        temperatureC: c.temperatureC,
        dutTemperatureC: c.dutTemperatureC,
        controlV: v,
        controlUncertaintyV:
          there && there.kvcoHzPerV !== 0 ? there.frequencyUncertaintyHz / Math.abs(there.kvcoHzPerV) : null,
        marginLowV: v === null ? null : v - Math.max(winLo, c.stallV ?? winLo),
        marginHighV: v === null ? null : winHi - v,
        stallV: c.stallV,
        stallUncertaintyV: c.stallUncertaintyV ?? null,
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
    pushingHzPerV: spreadOf(pushing.map((p) => ({ value: p.hzPerV, u: p.uncertaintyHzPerV }))),
    headroomTargetHz: targetHz,
    tuningWindowV: options.tuningWindowV,
    headroom,
    simulated: inputs.some((c) => c.simulated === true),
    overall: {
      kvcoHzPerV: spreadOf(done.map((r) => ({ value: r.kvcoAtNominalHzPerV as number, u: r.kvcoUncertaintyHzPerV }))),
      frequencyHz: spreadOf(
        done.map((r) => ({ value: r.frequencyAtNominalHz as number, u: r.frequencyUncertaintyHz })),
      ),
      temperatureRangeC: temps.length ? [temps[0] as number, temps[temps.length - 1] as number] : null,
      supplyRangeV: inputs.length
        ? [Math.min(...inputs.map((c) => c.supplyV)), Math.max(...inputs.map((c) => c.supplyV))]
        : null,
      units,
    },
  };
}
