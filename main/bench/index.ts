/** Bench assembly: role drivers from a bench config or the simulated bench. */
export { assembleBench, SIM_BENCH_CONFIG, type AssembledBench, type AssembleOptions } from './assemble.ts';
