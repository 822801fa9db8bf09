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
import type { ProcedurePort } from './ports.ts';

export const sweepPort: ProcedurePort = {
  columns: SWEEP_COLUMNS,
  validate: (plan, roles) => {
    validateSweepPlan(plan as SweepPlan);
    checkPlanAgainstBench(plan as SweepPlan, roles);
  },
  run: (o) => runSweep({ ...o, plan: o.plan as SweepPlan }),
};

export const driftPort: ProcedurePort = {
  columns: DRIFT_COLUMNS,
  validate: (plan, roles) => {
    validateDriftPlan(plan as DriftPlan);
    checkPlanAgainstBench(plan as DriftPlan, roles);
  },
  run: (o) => runDrift({ ...o, plan: o.plan as DriftPlan }),
};

export const pushingPort: ProcedurePort = {
  columns: PUSHING_COLUMNS,
  validate: (plan, roles) => {
    validatePushingPlan(plan as PushingPlan);
    checkPlanAgainstBench(plan as PushingPlan, roles);
  },
  run: (o) => runPushing({ ...o, plan: o.plan as PushingPlan }),
};
