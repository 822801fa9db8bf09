/**
 * The procedures as the service's ports: each validates its plan (alone and
 * against the bench) before a run folder exists, then runs. No Node here:
 * the desktop service (./default-ports.ts) and the web edition's page share it.
 */
import type { DriftPlan, PushingPlan, SweepPlan } from '../../app/contract/plans.ts';
import { DRIFT_COLUMNS, runDrift } from '../procedures/drift.ts';
import { PUSHING_COLUMNS, runPushing } from '../procedures/pushing.ts';
import {
  checkPlanAgainstBench,
  validateDriftPlan,
  validatePushingPlan,
  validateSweepPlan,
} from '../procedures/recorded-run.ts';
import { runSweep, SWEEP_COLUMNS } from '../procedures/sweep.ts';
import type { ProcedureOutcome } from '../procedures/types.ts';
import type { ProcedurePort, ProcedureRun } from './ports.ts';

type RecordedPlan = SweepPlan | DriftPlan | PushingPlan;

/**
 * One procedure as a port: its plan is checked alone and against the bench's counter before the run folder
 * exists. The service parsed the plan with this procedure's schema, hence the one cast here.
 */
function procedurePort<P extends RecordedPlan>(
  columns: readonly string[],
  validatePlan: (plan: P) => void,
  run: (options: Omit<ProcedureRun, 'plan'> & { plan: P }) => Promise<ProcedureOutcome>,
): ProcedurePort {
  return {
    columns,
    validate: (plan, roles) => {
      validatePlan(plan as P);
      checkPlanAgainstBench(plan as P, roles);
    },
    run: (o) => run({ ...o, plan: o.plan as P }),
  };
}

export const sweepPort = procedurePort<SweepPlan>(SWEEP_COLUMNS, validateSweepPlan, runSweep);
export const driftPort = procedurePort<DriftPlan>(DRIFT_COLUMNS, validateDriftPlan, runDrift);
export const pushingPort = procedurePort<PushingPlan>(PUSHING_COLUMNS, validatePushingPlan, runPushing);
