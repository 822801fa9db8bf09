/**
 * The short sweep the procedure and store tests run on the simulated
 * relaxation DUT: 1.6–3 V in 0.1 V steps, two 50 ms readings per point, no
 * edge search, safe state 0.5 V with the output off.
 */
import { sweepPlanSchema, type SweepPlan } from '../../../app/contract/plans.ts';

export const SHORT_SWEEP_PLAN: SweepPlan = sweepPlanSchema.parse({
  start: 1.6,
  stop: 3,
  step: 0.1,
  readingsPerPoint: 2,
  gateS: 0.05,
  settle: { mode: 'fixed', seconds: 0.05 },
  refineEdgeV: 0,
  limits: { maxControlV: 5, currentLimitA: 0.02 },
  safe: { controlV: 0.5, outputOff: true },
});
