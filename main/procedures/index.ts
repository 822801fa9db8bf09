/** The procedures' public surface (sweep, drift log, pushing, run control, safety). */
export { runSweep, SWEEP_COLUMNS, type SweepOptions, type SweepOutcome } from './sweep.ts';
export { runDrift, DRIFT_COLUMNS, type DriftOptions, type DriftOutcome } from './drift.ts';
export {
  runPushing,
  PUSHING_COLUMNS,
  checkPushingLimits,
  type PushingOptions,
  type PushingOutcome,
} from './pushing.ts';
export {
  recordSweep,
  recordDrift,
  recordPushing,
  resumeDrift,
  validateSweepPlan,
  validateDriftPlan,
  validatePushingPlan,
  type RecordOptions,
  type RecordableBench,
  type RecordedRun,
} from './recorded-run.ts';
export { RunControl, RunStoppedError, type RunControlOptions, type StopReason } from './run-control.ts';
export { LimitsError, checkLimits, checkControlV, applyLimits, ovpLevelV } from './limits.ts';
export { goSafe, type SafeStateResult } from './safe-state.ts';
export { stopOnSignals, type SignalSource } from './exit-guard.ts';
export { sweepSchedule, sweepLevels, MAX_SWEEP_POINTS, type SweepSchedule } from './sweep-points.ts';
export type { ProgressListener } from './progress.ts';
export type {
  BenchRoles,
  EventBody,
  FailureKind,
  ProcedureEvent,
  ProcedureOutcome,
  RunSink,
  SampleRow,
} from './types.ts';
