/**
 * The demo campaign (tunebench demo campaign), also the tests' campaign: a sensor-interface DUT whose
 * tuning sensitivity also moves with temperature, and a three-temperature,
 * three-corner plan sized for it.
 */
import type { CampaignPlanInput } from '../../../app/contract/campaign-plan.ts';
import { builtinDut } from '../../sim/builtin-duts.ts';
import type { DutParams } from '../../sim/dut-params.ts';

/** The shipped relaxation DUT with a tuning tempco of +600 ppm/°C and a 240 s thermal time constant. */
export function campaignDut(): DutParams {
  return { ...builtinDut('relaxation'), tuningTempcoPpmPerC: 600, thermalTauS: 240 };
}

export function campaignPlanInput(overrides: Partial<CampaignPlanInput> = {}): CampaignPlanInput {
  return {
    temperaturesC: [-10, 25, 60],
    supplyV: [4.75, 5, 5.25],
    maxSupplyV: 5.5,
    units: ['unit-a'],
    soak: { toleranceC: 0.2, maxSlopeCPerMin: 0.05, dwellS: 300, timeoutS: 7200, readIntervalS: 10 },
    chamber: { minC: -40, maxC: 85, maxRateCPerMin: 3 },
    sweep: {
      start: 1.5,
      stop: 4.2,
      step: 0.1,
      readingsPerPoint: 3,
      gateS: 0.1,
      settle: { mode: 'auto', maxS: 1 },
      refineEdgeV: 0.01,
      limits: { maxControlV: 5, currentLimitA: 0.02 },
    },
    safeC: 25,
    nominalControlV: 3,
    ...overrides,
  };
}
