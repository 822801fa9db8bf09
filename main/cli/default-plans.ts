/**
 * Plans used when the command line gets no --plan: sized for the built-in
 * simulated DUTs (the relaxation one stalls below about 1.55 V and tops out
 * near 4.3 V, so its default sweep stops at 4.25 V; the varactor one spans about 0.5–4.5 V), with limits that
 * keep a real 5 V tuning port safe too.
 */
import {
  driftPlanSchema,
  pushingPlanSchema,
  sweepPlanSchema,
  type DriftPlan,
  type PushingPlan,
  type SweepPlan,
} from '../../app/contract/plans.ts';

export type DefaultDut = 'relaxation' | 'varactor';

const LIMITS = { maxControlV: 5, currentLimitA: 0.02 };
const SAFE = { controlV: 0, outputOff: true };

export function defaultSweepPlan(dut: DefaultDut = 'relaxation'): SweepPlan {
  return sweepPlanSchema.parse({
    start: dut === 'relaxation' ? 1 : 0.5,
    stop: dut === 'relaxation' ? 4.25 : 4.5,
    step: 0.05,
    direction: 'up',
    readingsPerPoint: 3,
    gateS: 0.1,
    settle: { mode: 'auto', maxS: 1 },
    refineEdgeV: 0.001,
    limits: LIMITS,
    safe: SAFE,
  });
}

export function defaultDriftPlan(dut: DefaultDut = 'relaxation'): DriftPlan {
  return driftPlanSchema.parse({
    controlV: dut === 'relaxation' ? 3 : 2.5,
    intervalS: 1,
    durationS: 8 * 3600,
    gateS: 0.1,
    limits: LIMITS,
    safe: SAFE,
  });
}

/** DUT supply stepped ±10 % around nominal (5 V relaxation, 3.3 V varactor). */
export function defaultPushingPlan(dut: DefaultDut = 'relaxation'): PushingPlan {
  const nominalV = dut === 'relaxation' ? 5 : 3.3;
  return pushingPlanSchema.parse({
    controlV: dut === 'relaxation' ? 3 : 2.5,
    supplyStartV: Math.round(nominalV * 0.9 * 100) / 100,
    supplyStopV: Math.round(nominalV * 1.1 * 100) / 100,
    supplyStepV: nominalV / 20,
    readingsPerPoint: 5,
    gateS: 0.1,
    settleS: 0.2,
    maxSupplyV: Math.round(nominalV * 1.1 * 100) / 100,
    limits: LIMITS,
    safe: SAFE,
  });
}
