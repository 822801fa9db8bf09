/**
 * One soak: the chamber is told the setpoint, then the DUT thermometer (the
 * soak reference), the chamber's air sensor and — when the plan asks for a
 * drift limit — the counter at the nominal control voltage are read every
 * readIntervalS until the SoakDetector says soaked or the timeout passes.
 * A timeout is a result, not a throw: the campaign decides what it means.
 */
import type { SoakPlan } from '../../../app/contract/campaign-plan.ts';
import type { Limits } from '../../../app/contract/plans.ts';
import { DisconnectedError } from '../../instruments/errors.ts';
import type { Chamber } from '../../instruments/roles.ts';
import type { Clock } from '../../time/clock.ts';
import { applyLimits } from '../limits.ts';
import type { BenchRoles, EventBody } from '../types.ts';
import { SoakDetector } from './soak-detector.ts';

export interface SoakSample {
  timeS: number;
  setpointC: number;
  airC: number | null;
  dutC: number;
  frequencyHz: number | null;
}

export interface SoakOptions {
  bench: BenchRoles & { chamber: Chamber };
  clock: Clock;
  soak: SoakPlan;
  setpointC: number;
  signal: AbortSignal;
  /** For the drift limit: where the control voltage sits while soaking, within these limits. */
  drift?: { controlV: number; limits: Limits; gateS: number } | undefined;
  event: (event: EventBody) => void;
  onSample?: ((sample: SoakSample) => void) | undefined;
}

export interface SoakResult {
  result: 'soaked' | 'timeout';
  waitedS: number;
  dutC: number | null;
  airC: number | null;
}

export async function soakAt(options: SoakOptions): Promise<SoakResult> {
  const { bench, clock, soak, setpointC } = options;
  const thermometer = bench.thermometer;
  if (!thermometer) throw new Error('a soak needs the thermometer on the DUT (bench file: "thermometer")');
  await bench.chamber.setSetpoint(setpointC);
  const useDrift = soak.maxDriftPpmPerMin !== undefined && options.drift !== undefined;
  if (useDrift && options.drift) {
    await applyLimits(bench.supply, bench.controlChannel, options.drift.limits);
    await bench.supply.setVoltage(bench.controlChannel, options.drift.controlV);
    await bench.supply.setOutput(bench.controlChannel, true);
    await bench.counter.setGate(options.drift.gateS);
  }
  const detector = new SoakDetector({
    setpointC,
    toleranceC: soak.toleranceC,
    maxSlopeCPerMin: soak.maxSlopeCPerMin,
    dwellS: soak.dwellS,
    maxDriftPpmPerMin: useDrift ? soak.maxDriftPpmPerMin : undefined,
  });
  const startS = clock.now();
  options.event({
    type: 'soak-start',
    setpoint_c: setpointC,
    tolerance_c: soak.toleranceC,
    dwell_s: soak.dwellS,
    timeout_s: soak.timeoutS,
  });
  let last: SoakSample | null = null;
  for (;;) {
    const dutC = await thermometer.readTemperature();
    // The air reading is for the record: a bad reply leaves it blank, a lost link does not pass.
    const airC = await bench.chamber.readAirTemperature().catch((error: unknown) => {
      if (error instanceof DisconnectedError) throw error;
      return null;
    });
    let frequencyHz: number | null = null;
    if (useDrift) {
      const reading = await bench.counter.readFrequency();
      frequencyHz = reading.status === 'ok' ? reading.frequencyHz : null;
    }
    const timeS = clock.now();
    last = { timeS, setpointC, airC, dutC, frequencyHz };
    options.onSample?.(last);
    const verdict = detector.add({ timeS, dutC, frequencyHz: frequencyHz ?? undefined });
    const waitedS = timeS - startS;
    if (verdict.soaked) {
      options.event({
        type: 'soak-done',
        setpoint_c: setpointC,
        waited_s: waitedS,
        dut_c: dutC,
        air_c: airC,
        slope_c_per_min: verdict.slopeCPerMin,
        drift_ppm_per_min: verdict.driftPpmPerMin,
      });
      return { result: 'soaked', waitedS, dutC, airC };
    }
    if (waitedS >= soak.timeoutS) {
      options.event({
        type: 'soak-timeout',
        setpoint_c: setpointC,
        waited_s: waitedS,
        dut_c: dutC,
        air_c: airC,
        in_band_s: verdict.inBandS,
        slope_c_per_min: verdict.slopeCPerMin,
      });
      return { result: 'timeout', waitedS, dutC, airC };
    }
    await clock.sleep(soak.readIntervalS, options.signal);
  }
}
