/** Bench assembly and the command line's bench/plan files. */
export { assembleBench, SIM_BENCH_CONFIG, type AssembledBench, type AssembleOptions } from './assemble.ts';
export { ConfigFileError, loadBenchFile, loadSweepPlan, loadDriftPlan, loadPushingPlan, parseWith } from './config-files.ts';
export { defaultSweepPlan, defaultDriftPlan, defaultPushingPlan, type DefaultDut } from './default-plans.ts';
export { summarizeRun, type RunSummary } from './run-summary.ts';
